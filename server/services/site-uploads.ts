import { and, eq, max } from 'drizzle-orm'
import type { gaugeRecords, landMotionDraws } from '~~/server/db/schema'
import { outlooks, sites } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import type { RecomputationCause } from '#shared/types/causes'

// What a site's versioned uploads (its gauge record, its land-motion draws) share: the next version
// number, taken in turn, and the recomputation of the outlooks that rest on them.

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0]

/**
 * The next version of one of a site's uploads. Locks the site's row first, so two uploads at once take
 * their versions in turn instead of colliding on the unique (site, version).
 */
export async function nextUploadVersion(tx: Tx, siteId: string, table: typeof gaugeRecords | typeof landMotionDraws) {
  await tx.select({ id: sites.id }).from(sites).where(eq(sites.id, siteId)).for('update')
  const [latest] = await tx.select({ version: max(table.version) }).from(table).where(eq(table.siteId, siteId))
  return (latest?.version ?? 0) + 1
}

/**
 * In the transaction that changed something a site's outlooks rest on (a new gauge record, new
 * land-motion draws): queues the recomputation of its latest finished outlook of each scenario, with
 * the cause stored as a fact, and returns those scenarios (none: nothing to bring up to date). The
 * caller kicks the jobs after committing.
 */
export async function queueSiteRecomputation(tx: Tx, siteId: string, cause: RecomputationCause) {
  const finished = await tx.selectDistinct({ scenario: outlooks.scenario }).from(outlooks)
    .where(and(eq(outlooks.siteId, siteId), eq(outlooks.state, 'done'))).orderBy(outlooks.scenario)
  if (finished.length) await enqueueJob(tx, 'recompute-site', { siteId, cause })
  return finished.map(outlook => outlook.scenario)
}
