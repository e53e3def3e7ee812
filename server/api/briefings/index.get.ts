import { z } from 'zod'
import { listBriefings } from '~~/server/services/briefings'

const Query = z.object({ siteId: z.uuid({ error: 'siteId must be a site id.' }).optional() })

// The organisation's briefings (readers see issued ones), newest first.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { siteId } = readValidQuery(event, Query)
  return listBriefings(user, siteId)
})
