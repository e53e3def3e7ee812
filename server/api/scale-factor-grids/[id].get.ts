import { IdParams } from '#shared/schemas/params'
import { getScaleFactorGrid } from '~~/server/services/science-records'

export default defineEventHandler(async (event) => {
  const viewer = await optionalUser(event)
  const { id } = readValidParams(event, IdParams)
  const record = await getScaleFactorGrid(viewer, id)
  return { ...record, actions: viewer ? reviewActionsFor(viewer, record) : [] }
})
