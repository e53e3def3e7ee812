import { z } from 'zod'
import { briefingDocument, liveLink, sharedBriefing } from '~~/server/services/briefings'

const Params = z.object({ token: z.string().regex(/^[\w-]{20,64}$/) })

export default defineEventHandler(async (event) => {
  const { token } = readValidParams(event, Params)
  const briefing = await sharedBriefing(token)
  return sendBriefingPdf(event, await briefingDocument(briefing), liveLink(briefing, null))
})
