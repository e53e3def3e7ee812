import { ShareTokenParams } from '#shared/schemas/params'
import { briefingDocument, liveLink, sharedBriefing } from '~~/server/services/briefings'
import { sendBriefingPdf } from '~~/server/services/briefing-download'

export default defineEventHandler(async (event) => {
  const { token } = readValidParams(event, ShareTokenParams)
  const briefing = await sharedBriefing(token)
  return sendBriefingPdf(event, await briefingDocument(briefing), liveLink(briefing, null))
})
