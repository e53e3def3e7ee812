export default defineReviewAction('release', 'return')
