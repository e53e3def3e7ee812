import { PathwayParams } from '#shared/pathways/schemas'
import { deletePathway } from '~~/server/services/pathways/pathways'

// Refused (409) while decision records name the pathway: they keep showing what was decided on it.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id, pathwayId } = readValidParams(event, PathwayParams)
  return deletePathway(planner, id, pathwayId)
})
