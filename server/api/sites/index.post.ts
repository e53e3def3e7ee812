import { SiteSchema } from '#shared/schemas/sites'
import { createSite } from '~~/server/services/sites'

export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const input = await readValidBody(event, SiteSchema)
  const site = await createSite(planner, input)
  setResponseStatus(event, 201)
  return site
})
