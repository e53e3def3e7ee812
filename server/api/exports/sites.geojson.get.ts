import { sitesGeoJsonExport } from '~~/server/services/exports'

// The organisation's sites as GeoJSON (RFC 7946) with their headline under each planning scenario.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const collection = await sitesGeoJsonExport(user)
  setResponseHeader(event, 'content-type', 'application/geo+json; charset=utf-8')
  setResponseHeader(event, 'content-disposition', 'attachment; filename="brinkwater-sites.geojson"')
  setResponseHeader(event, 'cache-control', 'private, no-store')
  return JSON.stringify(collection)
})
