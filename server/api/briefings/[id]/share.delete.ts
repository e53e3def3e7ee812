import { IdParams } from '#shared/schemas/params'
import { setSharing } from '~~/server/services/briefings'

// Revokes the public link at once: it answers 404 from now on.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  return setSharing(planner, id, false)
})
