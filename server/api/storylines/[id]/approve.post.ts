export default defineReviewAction('storyline', 'approve')
