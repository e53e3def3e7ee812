import { IdParams } from '#shared/schemas/params'
import { pathwaysView } from '~~/server/services/pathways/view'

// A site's adaptation measures, pathways with their tipping and decision years per scenario, the
// decision records and any open decision alerts. Anyone in the site's organisation may read them.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  return pathwaysView(user, id)
})
