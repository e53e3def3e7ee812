export default defineReviewAction('scale-factor-grid', 'return')
