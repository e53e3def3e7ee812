import type { H3Event } from 'h3'

// A small fixed-window limiter kept in memory: enough to stop one address or one client from
// flooding public write endpoints or guessing passwords. Several app instances each keep their own
// count, so behind a load balancer the real limit is the limit times the number of instances.

interface Window { count: number, resetAt: number }
const windows = new Map<string, Window>()
// Windows that ended are dropped now and then, so one-off keys (addresses, clients) do not pile up.
let nextSweep = 0

function current(key: string, now: number): Window | undefined {
  if (now >= nextSweep) {
    for (const [k, w] of windows) if (w.resetAt <= now) windows.delete(k)
    nextSweep = now + 60_000
  }
  const window = windows.get(key)
  return window && window.resetAt > now ? window : undefined
}

function tooMany(event: H3Event | undefined, window: Window, now: number, message: string): never {
  const seconds = Math.max(1, Math.ceil((window.resetAt - now) / 1000))
  const minutes = Math.ceil(seconds / 60)
  if (event) setResponseHeader(event, 'retry-after', seconds)
  throw createError({
    statusCode: 429,
    message: `${message} Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`,
    data: { retryAfterSeconds: seconds },
  })
}

/** Counts this call; past `limit` calls in the window, 429 with Retry-After. */
export function rateLimit(key: string, limit: number, windowMs: number, what: string, event?: H3Event) {
  const now = Date.now()
  const window = current(key, now)
  if (!window) {
    windows.set(key, { count: 1, resetAt: now + windowMs })
    return
  }
  window.count++
  if (window.count > limit) tooMany(event, window, now, `Too many ${what}.`)
}

/** 429 with Retry-After once `limit` failures were counted for this key in its window. */
export function refuseIfLocked(event: H3Event, key: string, limit: number, message: string) {
  const now = Date.now()
  const window = current(key, now)
  if (window && window.count >= limit) tooMany(event, window, now, message)
}

/** Counts one failure; returns the count so far in this window. */
export function countFailure(key: string, windowMs: number): number {
  const now = Date.now()
  const window = current(key, now)
  if (!window) {
    windows.set(key, { count: 1, resetAt: now + windowMs })
    return 1
  }
  return ++window.count
}

export function clearFailures(key: string) {
  windows.delete(key)
}

export function clientKey(event: H3Event) {
  return getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === 'true' }) ?? 'unknown'
}
