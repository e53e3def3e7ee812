import { eq } from 'drizzle-orm'
import { outlooks, sites } from '~~/server/db/schema'
import type { CurrentUser } from '../utils/auth'
import { newerScience } from './outlooks'

type OutlookRow = typeof outlooks.$inferSelect

// A finished outlook never changes, so the latest ones read are kept in memory: a room full of people
// opening the same outlook skips reading and parsing its 120 kB result each time (measured with
// `npm run load`). Running and failed outlooks, and the site's own fields, are always read fresh.
const finished = new Map<string, OutlookRow>()
const MAX_FINISHED = 50

async function loadOutlook(id: string): Promise<OutlookRow | undefined> {
  const kept = finished.get(id)
  if (kept) return kept
  const db = await useDb()
  const [row] = await db.select().from(outlooks).where(eq(outlooks.id, id))
  if (row?.state === 'done') {
    finished.set(id, row)
    // A Map keeps insertion order: the first key is the oldest.
    if (finished.size > MAX_FINISHED) finished.delete(finished.keys().next().value!)
  }
  return row
}

export async function getOutlook(user: CurrentUser, id: string) {
  const outlook = await loadOutlook(id)
  const db = await useDb()
  const [site] = outlook
    ? await db.select({ name: sites.name, organisationId: sites.organisationId, referenceLevel: sites.referenceLevel }).from(sites).where(eq(sites.id, outlook.siteId))
    : []
  if (!outlook || !site || site.organisationId !== user.organisationId) throw createError({ statusCode: 404, message: 'No such outlook.' })
  // Which instance holds the lease is the server's business, not the reader's.
  const { claimedBy: _claimedBy, leaseUntil: _leaseUntil, attempts: _attempts, ...rest } = outlook
  return {
    ...rest,
    siteName: site.name,
    referenceLevel: site.referenceLevel,
    progress: outlook.state === 'running' ? outlook.progress : null,
    newerScience: await newerScience(outlook.scenario, outlook.releaseRefs),
  }
}
