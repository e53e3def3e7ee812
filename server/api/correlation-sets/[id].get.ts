import { IdParams } from '#shared/schemas/params'
import { getCorrelationSet } from '~~/server/services/science-records'

export default defineEventHandler(async (event) => {
  const viewer = await optionalUser(event)
  const { id } = readValidParams(event, IdParams)
  const record = await getCorrelationSet(viewer, id)
  return { ...record, actions: viewer ? reviewActionsFor(viewer, record) : [] }
})
