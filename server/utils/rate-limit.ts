import type { H3Event } from 'h3'

// A small fixed-window limiter kept in memory: enough to stop one address or one client from
// flooding public write endpoints. Several app instances each keep their own count.

const windows = new Map<string, { count: number, resetAt: number }>()

export function rateLimit(key: string, limit: number, windowMs: number, what: string) {
  const now = Date.now()
  const current = windows.get(key)
  if (!current || current.resetAt <= now) {
    windows.set(key, { count: 1, resetAt: now + windowMs })
    return
  }
  current.count++
  if (current.count > limit) {
    const minutes = Math.ceil((current.resetAt - now) / 60_000)
    throw createError({ statusCode: 429, message: `Too many ${what}. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.` })
  }
}

export function clientKey(event: H3Event) {
  return getRequestIP(event, { xForwardedFor: process.env.TRUST_PROXY === 'true' }) ?? 'unknown'
}
