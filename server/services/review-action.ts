import type { H3Event } from 'h3'
import { IdParams } from '#shared/schemas/params'
import { ReturnSchema, WithdrawSchema } from '#shared/schemas/releases'
import type { ReviewAction } from '#shared/review/rules'
import { applyReviewAction, type ReviewedKind } from './review'

// Review action routes share one handler: guard, the record's id, the action's body, then the service.

async function payloadFor(event: H3Event, action: ReviewAction) {
  if (action === 'withdraw') return readValidBody(event, WithdrawSchema)
  if (action === 'return') return readValidBody(event, ReturnSchema)
  return {}
}

/** A review action route (submit, approve, return, withdraw) for one kind of reviewed record. */
export function defineReviewAction(kind: ReviewedKind, action: ReviewAction) {
  return defineEventHandler(async (event) => {
    const user = await requireRole(event, 'analyst')
    const { id } = readValidParams(event, IdParams)
    const payload = await payloadFor(event, action)
    return applyReviewAction(kind, id, action, user, payload)
  })
}
