import { deepFreeze } from './deep-freeze'

/**
 * Reads that many requests make at once with the same key (who is signed in, a site's name, the latest
 * releases of a scenario) share one database query while it is pending: a request that arrives while an
 * identical query is queued or running takes that query's answer instead of queueing its own. Nothing is
 * kept once the query settles, so an answer is never older than a query that was still running when the
 * request came — the same as if the request had come a moment sooner.
 *
 * On a PostgreSQL server, a crowd of readers queues for the pool's few connections, one copy of each
 * query per reader; sharing them took 200 concurrent readers of one outlook from 289 to 781 requests a
 * second and their median wait from 604 to 214 ms (`npm run load`). On the embedded database a query
 * runs as soon as it is asked, so there is seldom one to share. Answers are frozen because every caller
 * gets the same object.
 *
 * Only for reads outside a transaction: a transaction must see its own writes.
 */
export function sharedReads<T>(read: (key: string) => Promise<T>): (key: string) => Promise<T> {
  const pending = new Map<string, Promise<T>>()
  return (key) => {
    const running = pending.get(key)
    if (running) return running
    const query = read(key).then(deepFreeze)
    pending.set(key, query)
    // Forget it however it ends, so the next request after it asks the database again.
    const forget = () => { pending.delete(key) }
    query.then(forget, forget)
    return query
  }
}
