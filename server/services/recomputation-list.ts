import { desc, eq, inArray, sql } from 'drizzle-orm'
import { jobs, outlooks, recomputations, users } from '~~/server/db/schema'

/** The latest recomputations with how far each has got, for the admin page. */
export async function listRecomputations(limit = 20) {
  const db = await useDb()
  const batches = await db
    .select({
      id: recomputations.id,
      scenario: recomputations.scenario,
      cause: recomputations.cause,
      siteCount: recomputations.siteCount,
      createdAt: recomputations.createdAt,
      requestedBy: users.name,
    })
    .from(recomputations)
    .leftJoin(users, eq(users.id, recomputations.requestedBy))
    .orderBy(desc(recomputations.createdAt))
    .limit(limit)
  const counts = batches.length
    ? await db
        .select({
          recomputationId: jobs.recomputationId,
          state: jobs.state,
          count: sql<number>`count(*)::int`,
          lastFinished: sql<Date | null>`max(${jobs.finishedAt})`.mapWith(jobs.finishedAt),
        })
        .from(jobs)
        .where(
          inArray(
            jobs.recomputationId,
            batches.map(b => b.id),
          ),
        )
        .groupBy(jobs.recomputationId, jobs.state)
    : []
  const [queue] = await db
    .select({ count: sql<number>`count(*)::int` })
    .from(outlooks)
    .where(eq(outlooks.state, 'running'))
  return {
    outlooksWaiting: queue?.count ?? 0,
    recomputations: batches.map((batch) => {
      const mine = counts.filter(c => c.recomputationId === batch.id)
      const of = (state: string) => mine.find(c => c.state === state)?.count ?? 0
      const pending = of('queued') + of('running')
      const lastFinished = mine.map(c => c.lastFinished?.getTime() ?? 0).reduce((a, b) => Math.max(a, b), 0)
      return {
        ...batch, done: of('done'), failed: of('failed'), pending,
        finishedAt: pending === 0 ? new Date(lastFinished || batch.createdAt.getTime()).toISOString() : null,
      }
    }),
  }
}
