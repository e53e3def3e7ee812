import { IdParams } from '#shared/schemas/params'
import { releaseCsv } from '#shared/releases/export'
import { getRelease } from '~~/server/services/releases'

// The distribution as a CSV file in metres, in the same layout the editor accepts.
export default defineEventHandler(async (event) => {
  const viewer = await optionalUser(event)
  const { id } = readValidParams(event, IdParams)
  const release = await getRelease(viewer, id)
  const name = `${release.component}-${release.scenario}-v${release.version}`.replace(/[^\w.-]+/g, '_')
  setResponseHeader(event, 'content-type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'content-disposition', `attachment; filename="${name}.csv"`)
  return releaseCsv(release.distribution)
})
