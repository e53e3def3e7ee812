import { defineReviewAction } from '~~/server/services/review-action'

export default defineReviewAction('release', 'approve')
