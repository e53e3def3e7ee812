import { createHash } from 'node:crypto'
import { eq, sql } from 'drizzle-orm'
import type { H3Event } from 'h3'
import { outlooks, sites } from '~~/server/db/schema'
import { storylineBasis, type StorylineBasis } from '#shared/storylines/rise'
import type { CurrentUser } from '../utils/auth'
import { preparedQuery } from '../utils/prepared-query'
import { recentReads } from '../utils/recent-reads'
import {
  acceptsGzip,
  gzipJsonBytes,
  jsonBytes,
  sendJsonBytes,
  sendNotModified,
  type JsonBytes,
} from '../utils/json-bytes'

type OutlookRow = typeof outlooks.$inferSelect

/**
 * An outlook as stored: what it was computed from, its state and its result; immutable once done.
 * Which instance holds the lease, and the progress (GET /api/outlooks/[id]/status), are not part of it.
 */
export type StoredOutlook = Omit<OutlookRow, 'claimedBy' | 'claimedAt' | 'leaseUntil' | 'attempts' | 'progress'>

// A finished outlook never changes, so the latest ones read are kept in memory as the bytes of their
// JSON (and, once a reader accepts it, gzip-encoded): a room full of people opening the same outlook
// skips reading, parsing, re-serialising and compressing its 120 kB result, and every response sends
// the same bytes instead of a fresh copy (which, held while slow readers drain it, filled the heap under
// `npm run load`). Running and failed outlooks are read fresh each time and never cached by a browser.
export interface ReadableOutlook {
  id: string
  siteId: string
  scenario: string
  state: OutlookRow['state']
  releaseRefs: OutlookRow['releaseRefs']
  /** What the published storylines need to be placed at this site (finished outlooks only). */
  storylineBasis: StorylineBasis | null
  json: JsonBytes<StoredOutlook>
  /** A strong validator of the bytes (a hash of them), for finished outlooks only. */
  etag: string | null
  /** The same bytes gzip-encoded, made by the first reader that accepts them. */
  gzipped: Promise<JsonBytes<StoredOutlook>> | null
}
const finished = new Map<string, ReadableOutlook>()
const loading = new Map<string, Promise<ReadableOutlook | undefined>>()
const MAX_FINISHED = 50

function stored(row: OutlookRow): StoredOutlook {
  const {
    claimedBy: _claimedBy,
    claimedAt: _claimedAt,
    leaseUntil: _leaseUntil,
    attempts: _attempts,
    progress: _progress,
    ...rest
  } = row
  return rest
}

function readable(row: OutlookRow): ReadableOutlook {
  const json = jsonBytes(stored(row))
  const done = row.state === 'done'
  return {
    id: row.id,
    siteId: row.siteId,
    scenario: row.scenario,
    state: row.state,
    releaseRefs: row.releaseRefs,
    storylineBasis: done ? storylineBasis(row.input) : null,
    json,
    etag: done ? `"${createHash('sha256').update(json).digest('base64url')}"` : null,
    gzipped: null,
  }
}

async function fromDatabase(id: string) {
  const db = await useDb()
  const [row] = await db.select().from(outlooks).where(eq(outlooks.id, id))
  if (!row) return undefined
  const outlook = readable(row)
  if (outlook.state !== 'done') return outlook
  finished.set(id, outlook)
  // A Map keeps insertion order: the first key is the oldest.
  if (finished.size > MAX_FINISHED) finished.delete(finished.keys().next().value!)
  return outlook
}

/** A finished outlook already in memory, without asking the database. */
export const keptOutlook = (id: string) => finished.get(id)

/** The outlook as readers see it; readers arriving while it is loaded share the load. */
export function loadOutlook(id: string): Promise<ReadableOutlook | undefined> {
  const kept = finished.get(id)
  if (kept) return Promise.resolve(kept)
  let load = loading.get(id)
  if (!load) {
    load = fromDatabase(id).finally(() => loading.delete(id))
    loading.set(id, load)
  }
  return load
}

/**
 * What a reader needs of an outlook's site: who owns it, and the fields shown beside the outlook. Only
 * GET routes read outlooks, so a read of the last moment will do (server/utils/recent-reads.ts).
 */
const siteQuery = preparedQuery(db =>
  db
    .select({ name: sites.name, organisationId: sites.organisationId, referenceLevel: sites.referenceLevel })
    .from(sites)
    .where(eq(sites.id, sql.placeholder('siteId')))
    .prepare('outlook_site'),
)
const siteOfOutlook = recentReads(async (siteId: string) => {
  const [site] = await (await siteQuery()).execute({ siteId })
  return site
})

/** The site of an outlook the user's organisation owns; 404 for any other, like a missing one. */
export async function readableSite(user: CurrentUser, outlook: { siteId: string } | undefined) {
  const site = outlook && await siteOfOutlook(outlook.siteId)
  if (!site || site.organisationId !== user.organisationId)
    throw createError({ statusCode: 404, message: 'No such outlook.' })
  return site
}

/** The outlook if the user's organisation owns it (404 otherwise, before anything about it is told). */
export async function readOutlook(user: CurrentUser, id: string): Promise<ReadableOutlook> {
  const outlook = await loadOutlook(id)
  await readableSite(user, outlook)
  return outlook!
}

/** Whether If-None-Match names this validator (weak comparison, as RFC 9110 asks for GET). */
function stillFresh(event: H3Event, etag: string) {
  const header = getRequestHeader(event, 'if-none-match')
  if (!header) return false
  return header.trim() === '*' || header.split(',').some(tag => tag.trim().replace(/^W\//, '') === etag)
}

/**
 * Answers GET /api/outlooks/[id] for an outlook the reader may see. A finished outlook carries its
 * ETag and `private, no-cache`: the browser keeps it and asks again each time, and an unchanged one
 * answers 304 with no body. It is gzip-encoded when the reader accepts that (its own ETag, as the
 * bytes differ). A running or failed one keeps the app's `private, no-store` and has no ETag.
 */
export async function sendStoredOutlook(event: H3Event, outlook: ReadableOutlook): Promise<StoredOutlook> {
  if (!outlook.etag) return sendJsonBytes(event, outlook.json)
  const gzip = acceptsGzip(event)
  const etag = gzip ? outlook.etag.replace(/"$/, '-gzip"') : outlook.etag
  // Per organisation, so private; revalidated on every read, although a finished outlook never changes,
  // so that a reader who lost access is refused (the guard above runs before any 304).
  setResponseHeaders(event, { 'cache-control': 'private, no-cache', 'etag': etag, 'vary': 'accept-encoding' })
  if (stillFresh(event, etag)) return sendNotModified(event)
  if (!gzip) return sendJsonBytes(event, outlook.json)
  outlook.gzipped ??= gzipJsonBytes(outlook.json)
  setResponseHeader(event, 'content-encoding', 'gzip')
  return sendJsonBytes(event, await outlook.gzipped)
}
