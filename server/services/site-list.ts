import { and, asc, count, desc, eq } from 'drizzle-orm'
import { outlooks, series, sites, thresholds } from '~~/server/db/schema'
import type { OutlookHeadline } from '#shared/types/outlook'
import type { OutlookResult } from '#shared/engine'
import { COMPONENTS, KNOWN_SCENARIOS } from '#shared/types/science'
import type { CurrentUser } from '../utils/auth'
import { latestReleases } from './science-inputs'

/** The year a site's headline number is given for (or the last year before it). */
export const HEADLINE_YEAR = 2100

/**
 * The first mean-sea-level threshold's chance of being passed in the headline year, its height above
 * the site's datum (`datumOffset`: mean sea level at the epoch above the datum). A flood level's
 * numbers mean something else and are never the headline.
 */
export function headlineOf(
  result: OutlookResult,
  labels: Map<string, string>,
  datumOffset = 0,
): OutlookHeadline | null {
  const threshold = result.thresholds.find(t => t.kind !== 'flood-level')
  if (!threshold) return null
  let index = result.years.findLastIndex(year => year <= HEADLINE_YEAR)
  if (index < 0) index = 0
  return {
    thresholdLabel: labels.get(threshold.key) ?? threshold.key,
    height: threshold.height + datumOffset,
    year: result.years[index]!,
    probability: threshold.byYear[index]!.value,
    triggerYears: threshold.triggerYears.map(({ tolerance, year }) => ({ tolerance, year })),
  }
}

/**
 * Each site of the caller's organisation with its headline under its planning scenario: the latest
 * finished outlook of that scenario, never whichever scenario ran last (null when none has run yet).
 */
export async function listSites(user: CurrentUser) {
  const db = await useDb()
  const rows = await db
    .select()
    .from(sites)
    .where(eq(sites.organisationId, user.organisationId))
    .orderBy(asc(sites.name))
  const planned = await db
    .selectDistinctOn([outlooks.siteId], {
      siteId: outlooks.siteId,
      id: outlooks.id,
      scenario: outlooks.scenario,
      headline: outlooks.headline,
      finishedAt: outlooks.finishedAt,
    })
    .from(outlooks)
    .innerJoin(sites, eq(sites.id, outlooks.siteId))
    .where(
      and(
        eq(sites.organisationId, user.organisationId),
        eq(outlooks.state, 'done'),
        eq(outlooks.scenario, sites.planningScenario),
      ),
    )
    .orderBy(outlooks.siteId, desc(outlooks.finishedAt))
  const counts = await db
    .select({ siteId: thresholds.siteId, n: count() })
    .from(thresholds)
    .innerJoin(sites, eq(sites.id, thresholds.siteId))
    .where(eq(sites.organisationId, user.organisationId))
    .groupBy(thresholds.siteId)
  return rows.map(site => ({
    id: site.id,
    name: site.name,
    latitude: site.latitude,
    longitude: site.longitude,
    landMotionRate: site.landMotionRate,
    landMotionSigma: site.landMotionSigma,
    thresholdCount: counts.find(c => c.siteId === site.id)?.n ?? 0,
    hasExtremes: site.gumbelScale !== null,
    planning: { scenario: site.planningScenario, tolerance: site.planningTolerance },
    planningOutlook: planned.find(o => o.siteId === site.id) ?? null,
  }))
}

/** Each scenario with published releases, and whether every component is covered. */
export async function scenarioCoverage() {
  const db = await useDb()
  const scenarios = new Set<string>(KNOWN_SCENARIOS)
  const seen = await db.selectDistinct({ scenario: series.scenario }).from(series)
  for (const row of seen) scenarios.add(row.scenario)
  return Promise.all([...scenarios].sort().map(async (scenario) => {
    const latest = await latestReleases(scenario)
    const missing = COMPONENTS.filter(c => !latest.has(c))
    return { scenario, complete: missing.length === 0, missing }
  }))
}
