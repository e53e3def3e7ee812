import { and, eq, inArray, sql } from 'drizzle-orm'
import { outlooks, releases, series, watches } from '~~/server/db/schema'
import type { CurrentUser } from '../utils/auth'

// What approving a release in review sets off, counted before anyone presses the button: the sites
// startRecomputation (recompute.ts) would compute again, every site with a finished outlook of the
// scenario whoever owns it, and the active watches on them, each of which may be mailed once.

export interface PublicationReach { sites: number, watchers: number }

export async function releaseReach(viewer: CurrentUser, id: string): Promise<PublicationReach> {
  const db = await useDb()
  const [release] = await db.select({ organisationId: releases.organisationId, state: releases.state, scenario: series.scenario })
    .from(releases).innerJoin(series, eq(series.id, releases.seriesId)).where(eq(releases.id, id))
  assertSameOrganisation(viewer, release?.organisationId, 'release')
  if (release!.state !== 'in-review') {
    throw createError({ statusCode: 409, message: 'Only a release in review is about to be published; this one is not in review.' })
  }
  const affected = db.selectDistinct({ siteId: outlooks.siteId }).from(outlooks)
    .where(and(eq(outlooks.state, 'done'), eq(outlooks.scenario, release!.scenario)))
  const [sites] = await db.select({ n: sql<number>`count(*)::int` }).from(affected.as('affected'))
  const [watchers] = await db.select({ n: sql<number>`count(*)::int` }).from(watches)
    .where(and(eq(watches.state, 'active'), inArray(watches.siteId, affected)))
  return { sites: sites?.n ?? 0, watchers: watchers?.n ?? 0 }
}
