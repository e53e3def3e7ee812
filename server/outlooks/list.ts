import { desc, eq } from 'drizzle-orm'
import { outlooks } from '~~/server/db/schema'

/** A site's outlooks, newest first, without their results. */
export async function listSiteOutlooks(siteId: string) {
  const db = await useDb()
  return db.select({
    id: outlooks.id, scenario: outlooks.scenario, samples: outlooks.samples, seed: outlooks.seed, state: outlooks.state,
    createdAt: outlooks.createdAt, finishedAt: outlooks.finishedAt, inputHash: outlooks.inputHash,
  }).from(outlooks).where(eq(outlooks.siteId, siteId)).orderBy(desc(outlooks.createdAt))
}
