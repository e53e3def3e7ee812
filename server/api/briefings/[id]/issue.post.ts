import { IdParams } from '#shared/schemas/params'
import { issueBriefing } from '~~/server/services/briefings'

// Freezes the document as it reads now, with today's date; from here on it never changes.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  return issueBriefing(planner, id)
})
