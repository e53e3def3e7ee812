import { eq } from 'drizzle-orm'
import { outlooks, sites } from '~~/server/db/schema'
import type { CurrentUser } from '../utils/auth'
import { newerScience, outlookProgress } from './outlooks'

export async function getOutlook(user: CurrentUser, id: string) {
  const db = await useDb()
  const [row] = await db.select({ outlook: outlooks, siteName: sites.name, organisationId: sites.organisationId, referenceLevel: sites.referenceLevel })
    .from(outlooks).innerJoin(sites, eq(sites.id, outlooks.siteId)).where(eq(outlooks.id, id))
  if (!row || row.organisationId !== user.organisationId) throw createError({ statusCode: 404, message: 'No such outlook.' })
  const { outlook } = row
  return {
    ...outlook,
    siteName: row.siteName,
    referenceLevel: row.referenceLevel,
    progress: outlook.state === 'running' ? outlookProgress(outlook.id) : null,
    newerScience: await newerScience(outlook.scenario, outlook.releaseRefs),
  }
}
