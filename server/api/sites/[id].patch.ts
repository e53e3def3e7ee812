import { SiteSchema } from '#shared/schemas/sites'
import { IdParams } from '#shared/schemas/params'
import { updateSite } from '~~/server/services/sites'

// Replaces the site's details and thresholds (the form always sends the whole site). The form sends
// If-Match with the updatedAt it was opened on, so two people editing one site cannot silently
// overwrite each other (412 for the later one); a request without it replaces unconditionally.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const input = await readValidBody(event, SiteSchema)
  const ifMatch = getRequestHeader(event, 'if-match')?.trim().replace(/^W\//, '').replace(/^"|"$/g, '')
  if (ifMatch && Number.isNaN(Date.parse(ifMatch))) {
    throw createError({
      statusCode: 400,
      message: 'If-Match must be the site\'s updatedAt as GET returned it, in quotes; or leave the header out.',
    })
  }
  return updateSite(planner, id, input, ifMatch || undefined)
})
