import { defineReviewAction } from '~~/server/services/review-action'

export default defineReviewAction('scale-factor-grid', 'submit')
