export default defineReviewAction('correlation-set', 'submit')
