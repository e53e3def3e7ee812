import { IdParams } from '#shared/schemas/users'
import { briefingDocument, liveLink, loadBriefing } from '~~/server/services/briefings'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const briefing = await loadBriefing(user, id)
  return sendBriefingPdf(event, await briefingDocument(briefing), liveLink(briefing, user))
})
