import { availableActions, type ReviewAction, type ReviewSubject } from '#shared/review/rules'
import type { CurrentUser } from './auth'

/** The review actions this person may take on a record (for the buttons the UI shows). */
export function reviewActionsFor(
  viewer: CurrentUser,
  record: ReviewSubject & { organisationId: string },
): ReviewAction[] {
  return record.organisationId === viewer.organisationId ? availableActions(record, viewer) : []
}
