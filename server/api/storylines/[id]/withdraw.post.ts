export default defineReviewAction('storyline', 'withdraw')
