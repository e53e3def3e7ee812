import { IdParams } from '#shared/schemas/params'
import { briefingDocument, liveLink, loadBriefing } from '~~/server/services/briefings'

// A briefing and its document (live for drafts, frozen once issued), and what newer outlooks change
// in an issued one (stored when they finished). Only planners see the link.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const row = await loadBriefing(user, id)
  const document = await briefingDocument(row)
  const { document: _frozen, shareToken, staleness, stalenessCheckedAt: _checked, ...briefing } = row
  const canEdit = user.role === 'planner'
  // Links are built on the configured address (APP_URL), never on the request's Host header.
  const live = liveLink(row, user)
  return {
    ...briefing,
    shareToken: canEdit ? shareToken : null,
    shared: shareToken !== null,
    canEdit,
    document,
    staleness: staleness && { changes: staleness.changes },
    appUrl: appUrl(),
    live: { url: `${appUrl()}${live.path}`, signIn: live.signIn },
  }
})
