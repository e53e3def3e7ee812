import { and, desc, eq, inArray, isNotNull, ne, sql } from 'drizzle-orm'
import { outlooks, releases, series, seriesAdoptions, sites, watches } from '~~/server/db/schema'
import { minOf } from '#shared/engine/arrays'
import type { CurrentUser } from '../utils/auth'
import { reachedSites } from './recompute'

// What publishing a release sets off, told before anyone submits or approves it: the sites
// startRecomputation (recompute.ts) would compute again (those with a finished outlook of the
// scenario in organisations that adopted the series), the active watches on them, each of which may
// be mailed once, and the anchor years it drops from the previous version: a dropped last anchor
// year shortens the horizon of every outlook that uses the series.

export interface AnchorYearChange {
  /** Anchor years the previous published version had and this one has not. */
  dropped: number[]
  /** The last anchor year before and after, when it changes. */
  horizon: { before: number, after: number } | null
  /** Sites whose latest outlook used this series and reaches a dropped year (they rely on it). */
  sitesRelying: number
}

export interface PublicationReach { sites: number, watchers: number, anchorYears: AnchorYearChange }

export async function releaseReach(viewer: CurrentUser, id: string): Promise<PublicationReach> {
  const db = await useDb()
  const [release] = await db
    .select({
      organisationId: releases.organisationId,
      state: releases.state,
      scenario: series.scenario,
      seriesId: releases.seriesId,
      anchorYears: releases.anchorYears,
    })
    .from(releases)
    .innerJoin(series, eq(series.id, releases.seriesId))
    .where(eq(releases.id, id))
  assertSameOrganisation(viewer, release?.organisationId, 'release')
  if (release!.state !== 'in-review' && release!.state !== 'draft') {
    throw createError({
      statusCode: 409,
      message: 'Only a draft or a release in review is still to be published; this one is not.',
    })
  }
  const affected = reachedSites(db, { scenario: release!.scenario, seriesId: release!.seriesId })
  const [siteCount] = await db.select({ n: sql<number>`count(*)::int` }).from(affected.as('affected'))
  const [watchers] = await db.select({ n: sql<number>`count(*)::int` }).from(watches)
    .where(and(eq(watches.state, 'active'), inArray(watches.siteId, affected)))
  return {
    sites: siteCount?.n ?? 0,
    watchers: watchers?.n ?? 0,
    anchorYears: await anchorYearChange(id, release!.seriesId, release!.anchorYears),
  }
}

/** Compares a version's anchor years with the version published before it in the same series. */
async function anchorYearChange(id: string, seriesId: string, anchorYears: number[]): Promise<AnchorYearChange> {
  const db = await useDb()
  const [previous] = await db.select({ anchorYears: releases.anchorYears }).from(releases)
    .where(and(eq(releases.seriesId, seriesId), ne(releases.id, id), isNotNull(releases.publishedAt)))
    .orderBy(desc(releases.publishedAt)).limit(1)
  if (!previous) return { dropped: [], horizon: null, sitesRelying: 0 }
  const dropped = previous.anchorYears.filter(year => !anchorYears.includes(year))
  const before = previous.anchorYears.at(-1)!
  const after = anchorYears.at(-1)!
  const horizon = before === after ? null : { before, after }
  if (!dropped.length) return { dropped, horizon, sitesRelying: 0 }
  // The latest finished outlook of each site (of an organisation that adopted the series) that used
  // this series; it relies on a dropped year when its output years reach it.
  const adopters = db
    .select({ id: seriesAdoptions.organisationId })
    .from(seriesAdoptions)
    .where(eq(seriesAdoptions.seriesId, seriesId))
  const used = await db
    .select({ siteId: outlooks.siteId, lastYear: sql<number>`(${outlooks.input}->'years'->>-1)::int` })
    .from(outlooks)
    .innerJoin(sites, eq(sites.id, outlooks.siteId))
    .where(
      and(
        eq(outlooks.state, 'done'),
        inArray(sites.organisationId, adopters),
        sql`${outlooks.releaseRefs} @> ${JSON.stringify([{ seriesId }])}::jsonb`,
      ),
    )
    .orderBy(desc(outlooks.finishedAt))
  const latest = new Map<string, number>()
  for (const row of used) if (!latest.has(row.siteId)) latest.set(row.siteId, Number(row.lastYear))
  const earliestDropped = minOf(dropped)
  return { dropped, horizon, sitesRelying: [...latest.values()].filter(last => last >= earliestDropped).length }
}
