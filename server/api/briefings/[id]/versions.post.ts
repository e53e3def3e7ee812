import { IdParams } from '#shared/schemas/users'
import { newBriefingVersion } from '~~/server/services/briefings'

// A new draft version that starts from this issued briefing and links back to it.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const draft = await newBriefingVersion(planner, id)
  setResponseStatus(event, 201)
  return draft
})
