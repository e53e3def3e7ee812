import { deepFreeze } from './deep-freeze'

/**
 * How long a read a crowd of GET requests repeats is kept: the longest another app instance's change
 * (a user disabled, science published there) can go unseen by this instance's GET requests. A change
 * made through this instance is seen at once (`forgetRecentReads`).
 */
export const RECENT_READ_MS = 2000

interface Kept<T> { value: Promise<T>, generation: number, until: number }

/** Past this many keys in one store, expired answers are dropped before another is kept. */
const MAX_KEPT = 1000

function dropExpired(kept: Map<string, Kept<unknown>>, now: number) {
  for (const [key, entry] of kept) if (entry.until <= now) kept.delete(key)
}

const everyStore = new Set<Map<string, Kept<unknown>>>()
let generation = 0

/**
 * Reads that every GET of a crowd repeats (who is signed in, whose site an outlook is on, the science
 * an organisation adopted) kept for RECENT_READ_MS: 200 readers of one outlook ask the embedded
 * database once every two seconds instead of twice a request. Concurrent callers share a pending read.
 * Only for GET requests and background reads that may be a moment old; a write reads afresh.
 *
 * `forgetRecentReads()` drops everything kept, and a read that was pending when it was called is
 * neither shared with later callers nor kept, since it may have started before the change committed.
 * Answers are frozen, because every caller gets the same object. Arguments after the key are what the
 * read needs to make its answer (only the first caller's are used), never part of what is asked.
 */
export function recentReads<T, Extra extends unknown[] = []>(
  read: (key: string, ...extra: Extra) => Promise<T>,
): (key: string, ...extra: Extra) => Promise<T> {
  const kept = new Map<string, Kept<T>>()
  everyStore.add(kept as Map<string, Kept<unknown>>)
  return (key, ...extra) => {
    const now = Date.now()
    const found = kept.get(key)
    if (found && found.generation === generation && found.until > now) return found.value
    const entry: Kept<T> = { value: read(key, ...extra).then(deepFreeze), generation, until: Number.POSITIVE_INFINITY }
    if (kept.size >= MAX_KEPT) dropExpired(kept as Map<string, Kept<unknown>>, now)
    kept.set(key, entry)
    entry.value.then(
      () => { entry.until = Date.now() + RECENT_READ_MS },
      () => { if (kept.get(key) === entry) kept.delete(key) },
    )
    return entry.value
  }
}

/**
 * Forget every kept read in this instance: called when a request that may have written has finished
 * its work (server/middleware/02.writes-forget-reads.ts), and by background work that changes what is
 * kept, after its transaction commits.
 */
export function forgetRecentReads() {
  generation++
  for (const kept of everyStore) kept.clear()
}
