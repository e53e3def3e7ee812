import { DecisionRecordSchema } from '#shared/pathways/schemas'
import { IdParams } from '#shared/schemas/params'
import { createRecord } from '~~/server/services/pathways/records'

// Records a council's decision (or a review of an earlier one). Records are never changed.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const input = await readValidBody(event, DecisionRecordSchema)
  setResponseStatus(event, 201)
  return createRecord(planner, id, input)
})
