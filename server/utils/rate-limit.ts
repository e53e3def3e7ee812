import type { H3Event } from 'h3'
import { sql } from 'drizzle-orm'

// A small fixed-window limiter, enough to stop one address or one client from flooding public write
// endpoints or guessing passwords. The counts live in the database (`rate_windows`), counted with one
// atomic upsert on the database's clock, so several app instances share one limit instead of each
// allowing the full amount.

interface Window { count: number, secondsLeft: number }
type Row = { count: number, seconds_left: number }

const rows = (result: unknown) => (result as { rows: Row[] }).rows
const toWindow = (row: Row | undefined): Window | undefined => row && { count: Number(row.count), secondsLeft: Number(row.seconds_left) }

/** Whole seconds until the window resets (at least 1), on the database's clock like the window itself. */
const SECONDS_LEFT = sql.raw('greatest(1, ceil(extract(epoch from reset_at - now())))::int as seconds_left')

// Windows that ended are deleted now and then, so one-off keys (addresses, clients) do not pile up.
const SWEEP_EVERY_MS = 60_000
let nextSweep = 0

async function sweep() {
  const now = Date.now()
  if (now < nextSweep) return
  nextSweep = now + SWEEP_EVERY_MS
  const db = await useDb()
  await db.execute(sql`delete from rate_windows where reset_at <= now()`)
}

/** Counts one call for `key` and returns its window: a new one if none is open. */
async function count(key: string, windowMs: number): Promise<Window> {
  const db = await useDb()
  const result = await db.execute(sql`
    insert into rate_windows (key, count, reset_at) values (${key}, 1, now() + ${windowMs / 1000}::float8 * interval '1 second')
    on conflict (key) do update set
      count = case when rate_windows.reset_at <= now() then 1 else rate_windows.count + 1 end,
      reset_at = case when rate_windows.reset_at <= now() then excluded.reset_at else rate_windows.reset_at end
    returning count, ${SECONDS_LEFT}`)
  await sweep()
  return toWindow(rows(result)[0])!
}

/** The open window of `key`, if any, without counting. */
async function peek(key: string): Promise<Window | undefined> {
  const db = await useDb()
  const result = await db.execute(sql`
    select count, ${SECONDS_LEFT} from rate_windows where key = ${key} and reset_at > now()`)
  return toWindow(rows(result)[0])
}

function tooMany(event: H3Event | undefined, window: Window, message: string): never {
  const seconds = window.secondsLeft
  const minutes = Math.ceil(seconds / 60)
  if (event) setResponseHeader(event, 'retry-after', seconds)
  throw createError({
    statusCode: 429,
    message: `${message} Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
    data: { retryAfterSeconds: seconds },
  })
}

/** Counts this call; past `limit` calls in the window, 429 with Retry-After. */
export async function rateLimit(key: string, limit: number, windowMs: number, what: string, event?: H3Event) {
  const window = await count(key, windowMs)
  if (window.count > limit) tooMany(event, window, `Too many ${what}.`)
}

/** 429 with Retry-After once `limit` failures were counted for this key in its window. */
export async function refuseIfLocked(event: H3Event, key: string, limit: number, message: string) {
  const window = await peek(key)
  if (window && window.count >= limit) tooMany(event, window, message)
}

/** Counts one failure; returns the count so far in this window. */
export async function countFailure(key: string, windowMs: number): Promise<number> {
  return (await count(key, windowMs)).count
}

export async function clearFailures(key: string) {
  const db = await useDb()
  await db.execute(sql`delete from rate_windows where key = ${key}`)
}

export function clientKey(event: H3Event) {
  return getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === 'true' }) ?? 'unknown'
}
