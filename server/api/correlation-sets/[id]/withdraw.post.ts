export default defineReviewAction('correlation-set', 'withdraw')
