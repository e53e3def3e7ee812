export default defineReviewAction('scale-factor-grid', 'withdraw')
