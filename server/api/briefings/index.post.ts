import { CreateBriefingSchema } from '#shared/schemas/briefings'
import { createBriefing } from '~~/server/services/briefings'

// A draft briefing from a finished outlook (and, optionally, other scenarios to compare).
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const input = await readValidBody(event, CreateBriefingSchema)
  const briefing = await createBriefing(planner, input)
  setResponseStatus(event, 201)
  return briefing
})
