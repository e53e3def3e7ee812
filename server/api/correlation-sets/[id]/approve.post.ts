export default defineReviewAction('correlation-set', 'approve')
