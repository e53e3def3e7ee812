import { IdParams } from '#shared/schemas/params'
import { readGaugeRecord } from '~~/server/services/gauge-records'

// The site's latest tide-gauge record with its fit, earlier versions, and tracking against each scenario's latest
// outlook.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  return readGaugeRecord(user, id)
})
