import { SiteSchema } from '#shared/schemas/sites'
import { IdParams } from '#shared/schemas/users'
import { updateSite } from '~~/server/services/sites'

// Replaces the site's details and thresholds (the form always sends the whole site).
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const input = await readValidBody(event, SiteSchema)
  return updateSite(planner, id, input)
})
