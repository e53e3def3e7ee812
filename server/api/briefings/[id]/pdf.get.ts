import { IdParams } from '#shared/schemas/params'
import { briefingDocument, liveLink, loadBriefing } from '~~/server/services/briefings'
import { sendBriefingPdf } from '~~/server/services/briefing-download'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const briefing = await loadBriefing(user, id)
  return sendBriefingPdf(event, await briefingDocument(briefing), liveLink(briefing, user))
})
