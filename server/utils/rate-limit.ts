import type { H3Event } from 'h3'
import { sql } from 'drizzle-orm'

// A small fixed-window limiter, enough to stop one address or one client from flooding public write
// endpoints or guessing passwords. The counts live in the database (`rate_windows`), counted with one
// atomic upsert on the database's clock, so several app instances share one limit instead of each
// allowing the full amount.

interface Window { count: number, secondsLeft: number }
type Row = { count: number, seconds_left: number }

const rows = (result: unknown) => (result as { rows: Row[] }).rows
const toWindow = (row: Row | undefined): Window | undefined =>
  row && { count: Number(row.count), secondsLeft: Number(row.seconds_left) }

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

/** "in 15 minutes", or "in 4 seconds" when less than a minute is left. */
function waitWords(seconds: number) {
  if (seconds < 60) return `${seconds} second${seconds === 1 ? '' : 's'}`
  const minutes = Math.ceil(seconds / 60)
  return `${minutes} minute${minutes === 1 ? '' : 's'}`
}

function tooMany(event: H3Event | undefined, window: Window, message: string): never {
  const seconds = window.secondsLeft
  if (event) setResponseHeader(event, 'retry-after', seconds)
  throw createError({
    statusCode: 429,
    message: `${message} Try again in ${waitWords(seconds)}.`,
    data: { retryAfterSeconds: seconds },
  })
}

/** Counts this call; past `limit` calls in the window, 429 with Retry-After. */
export async function rateLimit(key: string, limit: number, windowMs: number, what: string, event?: H3Event) {
  const window = await count(key, windowMs)
  if (window.count > limit) tooMany(event, window, `Too many ${what}.`)
}

/**
 * Takes one of `limit` attempts in `key`'s window, or refuses with 429 when all are taken. The check
 * and the count are one conditional upsert, so concurrent requests cannot all pass a check made
 * before any of them counted (the row is locked by the upsert; PostgreSQL re-checks the condition
 * on the latest row). Give the attempt back with `returnAttempt` when it turns out not to count.
 */
export async function takeAttempt(event: H3Event, key: string, limit: number, windowMs: number, message: string) {
  const taken = await tryTakeAttempt(key, limit, windowMs)
  if (taken !== null) return taken
  tooMany(event, (await peek(key)) ?? { count: limit, secondsLeft: 1 }, message)
}

/** `takeAttempt` without the refusal: the count with this attempt, or null when all are taken. */
export async function tryTakeAttempt(key: string, limit: number, windowMs: number): Promise<number | null> {
  const db = await useDb()
  const result = await db.execute(sql`
    insert into rate_windows (key, count, reset_at) values (${key}, 1, now() + ${windowMs / 1000}::float8 * interval '1 second')
    on conflict (key) do update set
      count = case when rate_windows.reset_at <= now() then 1 else rate_windows.count + 1 end,
      reset_at = case when rate_windows.reset_at <= now() then excluded.reset_at else rate_windows.reset_at end
    where rate_windows.reset_at <= now() or rate_windows.count < ${limit}
    returning count, ${SECONDS_LEFT}`)
  return toWindow(rows(result)[0])?.count ?? null
}

/** Gives back an attempt taken with `takeAttempt` (a success does not count against the limit). */
export async function returnAttempt(key: string) {
  const db = await useDb()
  await db.execute(sql`update rate_windows set count = greatest(0, count - 1) where key = ${key} and reset_at > now()`)
}

export async function clearFailures(key: string) {
  const db = await useDb()
  await db.execute(sql`delete from rate_windows where key = ${key}`)
}

export function clientKey(event: H3Event) {
  return getRequestIP(event, { xForwardedFor: serverConfig().TRUST_PROXY }) ?? 'unknown'
}
