export default defineReviewAction('release', 'submit')
