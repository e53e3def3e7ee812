import { IdParams } from '#shared/schemas/params'
import { outlookCsvExport } from '~~/server/services/exports'

// A finished outlook as CSV: years × percentiles and thresholds × chances, with its provenance in header rows.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const { csv, name } = await outlookCsvExport(user, id)
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="${name}"`)
  setResponseHeader(event, 'cache-control', 'private, no-store')
  return csv
})
