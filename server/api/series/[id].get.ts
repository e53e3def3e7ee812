import { IdParams } from '#shared/schemas/params'
import { listReleases } from '~~/server/services/releases'

// A series' history: every version this person may see, newest first, with its bands.
export default defineEventHandler(async (event) => {
  const viewer = await optionalUser(event)
  const { id } = readValidParams(event, IdParams)
  const versions = await listReleases(viewer, { seriesId: id })
  if (!versions.length) throw createError({ statusCode: 404, message: 'No such series.' })
  const { seriesId, component, scenario, title, organisationName, illustrative } = versions[0]!
  return { series: { id: seriesId, component, scenario, title, organisationName, illustrative }, versions }
})
