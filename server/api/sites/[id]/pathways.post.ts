import { PathwaySchema } from '#shared/pathways/schemas'
import { IdParams } from '#shared/schemas/params'
import { createPathway } from '~~/server/services/pathways/pathways'

export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const input = await readValidBody(event, PathwaySchema)
  setResponseStatus(event, 201)
  return createPathway(planner, id, input)
})
