import type { H3Event } from 'h3'
import { IdParams } from '#shared/schemas/users'
import { ReturnSchema, WithdrawSchema } from '#shared/schemas/releases'
import { availableActions, type ReviewAction, type ReviewSubject } from '#shared/review/rules'
import { applyReviewAction, type ReviewedKind } from '../services/review'
import type { CurrentUser } from './auth'

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

/** The review actions this person may take on a record (for the buttons the UI shows). */
export function reviewActionsFor(viewer: CurrentUser, record: ReviewSubject & { organisationId: string }): ReviewAction[] {
  return record.organisationId === viewer.organisationId ? availableActions(record, viewer) : []
}
