import { MeasureSchema } from '#shared/pathways/schemas'
import { IdParams } from '#shared/schemas/params'
import { createMeasure } from '~~/server/services/pathways/measures'

export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const input = await readValidBody(event, MeasureSchema)
  setResponseStatus(event, 201)
  return createMeasure(planner, id, input)
})
