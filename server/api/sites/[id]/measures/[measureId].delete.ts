import { MeasureParams } from '#shared/pathways/schemas'
import { deleteMeasure } from '~~/server/services/pathways/measures'

// Refused (409, naming it) while a pathway lists the measure or a decision record names it.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id, measureId } = readValidParams(event, MeasureParams)
  return deleteMeasure(planner, id, measureId)
})
