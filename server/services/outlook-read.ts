import { eq } from 'drizzle-orm'
import { outlooks, sites } from '~~/server/db/schema'
import type { CurrentUser } from '../utils/auth'
import { newerScience } from './outlooks'

type OutlookRow = typeof outlooks.$inferSelect

// A finished outlook never changes, so the latest ones read are kept in memory, already turned into
// JSON: a room full of people opening the same outlook skips reading, parsing and re-serialising its
// 120 kB result each time (measured with `npm run load`). Running and failed outlooks, the site's own
// fields and the newer-science check are always read fresh.
interface Kept { row: OutlookRow, json: string }
const finished = new Map<string, Kept>()
const MAX_FINISHED = 50

/** What a reader sees of the stored row: which instance holds the lease is the server's business. */
function readerFields(row: OutlookRow) {
  const { claimedBy: _claimedBy, leaseUntil: _leaseUntil, attempts: _attempts, progress: _progress, ...rest } = row
  return rest
}

async function loadOutlook(id: string): Promise<{ row: OutlookRow, json?: string } | undefined> {
  const kept = finished.get(id)
  if (kept) return kept
  const db = await useDb()
  const [row] = await db.select().from(outlooks).where(eq(outlooks.id, id))
  if (row?.state !== 'done') return row && { row }
  const fresh = { row, json: JSON.stringify(readerFields(row)) }
  finished.set(id, fresh)
  // A Map keeps insertion order: the first key is the oldest.
  if (finished.size > MAX_FINISHED) finished.delete(finished.keys().next().value!)
  return fresh
}

/** The outlook as JSON text, with its site's name, progress and whether newer science exists. */
export async function getOutlookJson(user: CurrentUser, id: string): Promise<string> {
  const loaded = await loadOutlook(id)
  const db = await useDb()
  const [site] = loaded
    ? await db.select({ name: sites.name, organisationId: sites.organisationId, referenceLevel: sites.referenceLevel }).from(sites).where(eq(sites.id, loaded.row.siteId))
    : []
  if (!loaded || !site || site.organisationId !== user.organisationId) throw createError({ statusCode: 404, message: 'No such outlook.' })
  const { row } = loaded
  const live = JSON.stringify({
    siteName: site.name,
    referenceLevel: site.referenceLevel,
    progress: row.state === 'running' ? row.progress : null,
    newerScience: await newerScience(row.scenario, row.releaseRefs),
  })
  // Two JSON objects joined into one: the stored fields, then the live ones (no key is in both).
  const stored = loaded.json ?? JSON.stringify(readerFields(row))
  return `${stored.slice(0, -1)},${live.slice(1)}`
}
