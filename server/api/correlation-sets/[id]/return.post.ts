export default defineReviewAction('correlation-set', 'return')
