import { and, eq } from 'drizzle-orm'
import { outlooks } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import type { RecomputationCause } from '#shared/types/causes'

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0]

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
