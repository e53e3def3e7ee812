export default defineReviewAction('storyline', 'submit')
