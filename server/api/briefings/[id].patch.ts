import { UpdateBriefingSchema } from '#shared/schemas/briefings'
import { IdParams } from '#shared/schemas/params'
import { updateBriefing } from '~~/server/services/briefings'

// Drafts change; an issued briefing answers 409 (start a new version instead).
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const input = await readValidBody(event, UpdateBriefingSchema)
  return updateBriefing(planner, id, input)
})
