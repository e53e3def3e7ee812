import { IdParams } from '#shared/schemas/params'
import { setSharing } from '~~/server/services/briefings'

// A public, unguessable, revocable link to an issued briefing.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  return setSharing(planner, id, true)
})
