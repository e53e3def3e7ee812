import { ShareTokenParams } from '#shared/schemas/params'
import { briefingDocument, sharedBriefing } from '~~/server/services/briefings'

// Public: an issued briefing by its share link, read-only, until the link is revoked, saying which of
// its numbers newer outlooks have changed (stored when they finished; the figures only: no outlook or
// threshold ids).
export default defineEventHandler(async (event) => {
  const { token } = readValidParams(event, ShareTokenParams)
  const briefing = await sharedBriefing(token)
  // The address printed on the page is the configured one (APP_URL), never the request's Host header.
  const changes = briefing.staleness?.changes.map(({ thresholdId: _id, ...change }) => change) ?? null
  return {
    staleness: changes && { changes },
    id: briefing.id,
    version: briefing.version,
    issuedAt: briefing.issuedAt,
    siteId: briefing.siteId,
    link: `${appUrl()}/shared/${token}`,
    document: await briefingDocument(briefing),
  }
})
