export default defineReviewAction('scale-factor-grid', 'submit')
