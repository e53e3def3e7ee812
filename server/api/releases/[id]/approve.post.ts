export default defineReviewAction('release', 'approve')
