import { GaugeRecordSchema } from '#shared/schemas/sites'
import { IdParams } from '#shared/schemas/params'
import { uploadGaugeRecord } from '~~/server/services/gauge-records'

// A new version of the site's tide-gauge record (CSV year[,month],height[,flag]), fitted on upload.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const { csv } = await readValidBody(event, GaugeRecordSchema)
  setResponseStatus(event, 201)
  return uploadGaugeRecord(planner, id, csv)
})
