import { MeasureParams, MeasureSchema } from '#shared/pathways/schemas'
import { updateMeasure } from '~~/server/services/pathways/measures'

// The whole measure as the form sends it. A measure named by decision records keeps its height, kind
// and lead time (409 saying what to do instead).
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id, measureId } = readValidParams(event, MeasureParams)
  const input = await readValidBody(event, MeasureSchema)
  return updateMeasure(planner, id, measureId, input)
})
