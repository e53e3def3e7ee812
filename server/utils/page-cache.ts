import type { H3Event } from 'h3'
import { and, eq, max } from 'drizzle-orm'
import { briefings, outlooks } from '~~/server/db/schema'
import { deflatePieces, gzipWithInsert, type DeflatedPieces } from './spliced-gzip'

// The HTML of shared briefing pages, kept in memory so a link passed round a council meeting is
// rendered once, not for every reader. An issued briefing never changes, so its page only changes
// with the reader's language and cookies. Rules:
// - only anonymous GETs without a query string (no session cookie) are cached or served from here;
// - a revoked link answers 404 at once on the instance that revoked it, and within a second on any
//   other instance sharing the database (hits re-check the link at most once a second);
// - a page stored before its site's latest outlook finished is rendered again (it may now say that
//   newer science changed the briefing's numbers), checked with the same once-a-second look;
// - each response gets a fresh CSP nonce: the page is stored with the nonce it was rendered with,
//   and on the way out that value is replaced in the header and the tags by this response's nonce.
//   Markup injected into the page could not have known the render-time nonce, so it stays blocked;
// - a reader whose browser accepts gzip (every browser) gets the page compressed, about a quarter of
//   its bytes: compressed once when stored, with the fresh nonce between the pieces (spliced-gzip.ts).

// The page is kept as bytes split where the render-time nonce stood, so a hit joins bytes with its
// own nonce instead of searching and re-encoding the whole page.
interface CachedPage {
  parts: Buffer[]
  gzip?: DeflatedPieces
  headers: Record<string, string>
  nonce: string
  storedAt: number
}

const MAX_PAGES = 100
const MAX_AGE_MS = 10 * 60_000
const pages = new Map<string, CachedPage>()
const TOKEN_PATH = /^\/shared\/([\w-]{20,64})$/
// Headers that belong to one response only.
const NOT_REPLAYED = new Set(['set-cookie', 'content-length', 'date', 'connection', 'transfer-encoding', 'keep-alive'])
const SESSION_COOKIE = 'brinkwater-session='

/** The share token when this request may use the cache; undefined otherwise. */
export function cacheableSharedToken(event: H3Event): string | undefined {
  if (event.method !== 'GET') return undefined
  const cookies = getRequestHeader(event, 'cookie') ?? ''
  if (cookies.includes(SESSION_COOKIE)) return undefined
  return TOKEN_PATH.exec(event.path)?.[1]
}

// The cookies the server reads while rendering (language, units, scenario); a new one that changes
// what the server renders must be added here.
const RENDER_COOKIES = ['brinkwater_locale', 'brinkwater_units', 'brinkwater_scenario']

/** Everything that can change the rendered page for one token: host (links), language and those cookies. */
export function sharedPageKey(event: H3Event, token: string) {
  const cookies = parseCookies(event)
  return [
    token,
    ...['host', 'x-forwarded-host', 'x-forwarded-proto', 'accept-language'].map(name =>
      (getRequestHeader(event, name) ?? '').slice(0, 512),
    ),
    ...RENDER_COOKIES.map(name => (cookies[name] ?? '').slice(0, 64)),
  ].join('\n')
}

// A page hit asks the database at most once a second per link (one query costs more than serving
// the page). The instance that revokes a link forgets it at once (forgetSharedPages, called by
// setSharing); another instance sharing the database stops serving it within this interval.
const LIVE_RECHECK_MS = 1000
const liveUntil = new Map<string, { until: number, outlookAt: number }>()

/**
 * Whether the link still opens an issued briefing, and when its site's latest outlook finished or its
 * staleness was last stored, whichever is later (ms; 0 when neither): a page stored before then is
 * rendered again. False for a revoked link.
 */
export async function shareIsLive(token: string): Promise<false | { outlookAt: number }> {
  const now = Date.now()
  const known = liveUntil.get(token)
  if (known && known.until > now) return { outlookAt: known.outlookAt }
  const db = await useDb()
  const [row] = await db
    .select({ id: briefings.id, outlookAt: max(outlooks.finishedAt), checkedAt: briefings.stalenessCheckedAt })
    .from(briefings)
    .leftJoin(outlooks, and(eq(outlooks.siteId, briefings.siteId), eq(outlooks.state, 'done')))
    .where(and(eq(briefings.shareToken, token), eq(briefings.state, 'issued'))).groupBy(briefings.id).limit(1)
  if (!row) {
    liveUntil.delete(token)
    return false
  }
  // The page says what newer outlooks changed, stored a little after they finish.
  const outlookAt = Math.max(row.outlookAt ? new Date(row.outlookAt).getTime() : 0, row.checkedAt?.getTime() ?? 0)
  liveUntil.set(token, { until: now + LIVE_RECHECK_MS, outlookAt })
  return { outlookAt }
}

export function cachedSharedPage(key: string): CachedPage | undefined {
  const page = pages.get(key)
  if (!page) return undefined
  if (Date.now() - page.storedAt > MAX_AGE_MS) {
    pages.delete(key)
    return undefined
  }
  return page
}

export function storeSharedPage(key: string, body: string, headers: Record<string, string>, nonce: string) {
  const kept = Object.fromEntries(Object.entries(headers).filter(([name]) => !NOT_REPLAYED.has(name.toLowerCase())))
  const parts = (nonce ? body.split(`nonce="${nonce}"`) : [body]).map(part => Buffer.from(part))
  const gzip = deflatePieces(parts, nonce ? nonceAttribute(nonce).length : 0)
  pages.delete(key)
  pages.set(key, { parts, gzip, headers: kept, nonce, storedAt: Date.now() })
  // A Map keeps insertion order: the first key is the oldest page.
  while (pages.size > MAX_PAGES) pages.delete(pages.keys().next().value!)
}

/** Forgets every cached page of a token (it was revoked). */
export function forgetSharedPages(token: string) {
  liveUntil.delete(token)
  for (const key of pages.keys()) if (key.startsWith(`${token}\n`)) pages.delete(key)
}

const nonceAttribute = (nonce: string) => Buffer.from(`nonce="${nonce}"`)

/**
 * The stored page with its render-time nonce replaced by a fresh one, in the tags and the header, as
 * the stored pieces with the new attribute between them: written one after another, so no request
 * copies the whole page (the copies were most of the garbage under `npm run load`). Gzip-encoded when
 * the reader accepts it; a fresh nonce of another length than the stored one's is sent unencoded.
 */
export function withFreshNonce(page: CachedPage, nonce: string, acceptsGzip: boolean) {
  const vary = page.headers.vary ? `${page.headers.vary}, accept-encoding` : 'accept-encoding'
  const headers: Record<string, string> = { ...page.headers, vary }
  const csp = headers['content-security-policy']
  if (page.nonce && csp) headers['content-security-policy'] = csp.replaceAll(`'nonce-${page.nonce}'`, `'nonce-${nonce}'`)
  const attribute = page.nonce ? nonceAttribute(nonce) : Buffer.alloc(0)
  if (acceptsGzip && page.gzip?.insertLength === attribute.length) {
    const chunks = gzipWithInsert(page.gzip, attribute)
    return { chunks, length: byteLength(chunks), headers: { ...headers, 'content-encoding': 'gzip' } }
  }
  const chunks = page.parts.flatMap((part, i) => (i ? [attribute, part] : [part]))
  return { chunks, length: byteLength(chunks), headers }
}

const byteLength = (chunks: Buffer[]) => chunks.reduce((sum, chunk) => sum + chunk.length, 0)
