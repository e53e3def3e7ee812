export default defineReviewAction('release', 'withdraw')
