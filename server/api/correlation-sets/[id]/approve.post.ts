import { defineReviewAction } from '~~/server/services/review-action'

export default defineReviewAction('correlation-set', 'approve')
