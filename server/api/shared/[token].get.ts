import { z } from 'zod'
import { briefingDocument, sharedBriefing } from '~~/server/services/briefings'

const Params = z.object({ token: z.string().regex(/^[\w-]{20,64}$/) })

// Public: an issued briefing by its share link, read-only, until the link is revoked.
export default defineEventHandler(async (event) => {
  const { token } = readValidParams(event, Params)
  const briefing = await sharedBriefing(token)
  // The address printed on the page is the configured one (APP_URL), never the request's Host header.
  return { id: briefing.id, version: briefing.version, issuedAt: briefing.issuedAt, siteId: briefing.siteId, link: `${appUrl()}/shared/${token}`, document: await briefingDocument(briefing) }
})
