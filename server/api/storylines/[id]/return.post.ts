export default defineReviewAction('storyline', 'return')
