import { eq } from 'drizzle-orm'
import { outlooks, sites } from '~~/server/db/schema'
import type { CurrentUser } from '../utils/auth'
import { newerScience } from './outlooks'

export async function getOutlook(user: CurrentUser, id: string) {
  const db = await useDb()
  const [row] = await db.select({ outlook: outlooks, siteName: sites.name, organisationId: sites.organisationId, referenceLevel: sites.referenceLevel })
    .from(outlooks).innerJoin(sites, eq(sites.id, outlooks.siteId)).where(eq(outlooks.id, id))
  if (!row || row.organisationId !== user.organisationId) throw createError({ statusCode: 404, message: 'No such outlook.' })
  // Which instance holds the lease is the server's business, not the reader's.
  const { claimedBy: _claimedBy, leaseUntil: _leaseUntil, attempts: _attempts, ...outlook } = row.outlook
  return {
    ...outlook,
    siteName: row.siteName,
    referenceLevel: row.referenceLevel,
    progress: outlook.state === 'running' ? outlook.progress : null,
    newerScience: await newerScience(outlook.scenario, outlook.releaseRefs),
  }
}
