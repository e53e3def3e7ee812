import { PathwayParams, PathwaySchema } from '#shared/pathways/schemas'
import { updatePathway } from '~~/server/services/pathways/pathways'

// The whole pathway as the form sends it, its sequence checked again (measures of the site, no cycles).
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id, pathwayId } = readValidParams(event, PathwayParams)
  const input = await readValidBody(event, PathwaySchema)
  return updatePathway(planner, id, pathwayId, input)
})
