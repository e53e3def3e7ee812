export default defineReviewAction('scale-factor-grid', 'approve')
