import { and, desc, eq, sql } from 'drizzle-orm'
import { correlationSets, releaseDraws, releases, scaleFactorGrids, series } from '~~/server/db/schema'
import { interpolateFactor } from '#shared/releases/grid'
import { COMPONENTS } from '#shared/types/science'
import { preparedQuery } from '../utils/prepared-query'
import { sharedReads } from '../utils/shared-reads'
import { decodeDraws } from './releases'

// The published science an outlook uses for one scenario: the latest published release of every
// component, the latest correlation set, and each component's scale factor at the site.

export interface ScienceComponent {
  component: string
  releaseId: string
  seriesId: string
  version: number
  title: string
  citation: string
  release: Record<string, unknown>
}

/** Latest published release per component (most recently published wins across series). */
export async function latestReleases(scenario: string) {
  const db = await useDb()
  const rows = await db.select({
    id: releases.id, version: releases.version, form: releases.form, baselineYear: releases.baselineYear,
    anchorYears: releases.anchorYears, parameters: releases.parameters, citation: releases.citation,
    seriesId: series.id, component: series.component, title: series.title,
  }).from(releases).innerJoin(series, eq(series.id, releases.seriesId))
    .where(and(eq(series.scenario, scenario), eq(releases.state, 'published')))
    .orderBy(desc(releases.publishedAt))
  const latest = new Map<string, typeof rows[number]>()
  for (const row of rows) if (!latest.has(row.component)) latest.set(row.component, row)
  return latest
}

const releaseVersionsQuery = preparedQuery(db => db.select({ id: releases.id, version: releases.version, component: series.component })
  .from(releases).innerJoin(series, eq(series.id, releases.seriesId))
  .where(and(eq(series.scenario, sql.placeholder('scenario')), eq(releases.state, 'published')))
  .orderBy(desc(releases.publishedAt))
  .prepare('latest_release_versions'))

/**
 * The latest published release of each component for a scenario: id and version only, for the
 * newer-science check every outlook read makes (the parameters can be large and are not needed).
 * Concurrent calls share one query (`sharedReads`).
 */
export const latestReleaseVersions = sharedReads(async (scenario: string) => {
  const rows = await (await releaseVersionsQuery()).execute({ scenario })
  const latest = new Map<string, typeof rows[number]>()
  for (const row of rows) if (!latest.has(row.component)) latest.set(row.component, row)
  return latest as ReadonlyMap<string, typeof rows[number]>
})

export async function scienceFor(scenario: string): Promise<ScienceComponent[]> {
  const latest = await latestReleases(scenario)
  const missing = COMPONENTS.filter(component => !latest.has(component))
  if (missing.length) {
    throw createError({ statusCode: 400, message: `scenario: No published release for ${missing.join(', ')} under ${scenario}. Choose another scenario, or ask an analyst to publish ${missing.length > 1 ? 'them' : 'it'}.` })
  }
  const db = await useDb()
  return Promise.all(COMPONENTS.map(async (component) => {
    const row = latest.get(component)!
    const release: Record<string, unknown> = { form: row.form, baselineYear: row.baselineYear, anchorYears: row.anchorYears, ...row.parameters }
    if (row.form === 'samples') {
      const [stored] = await db.select().from(releaseDraws).where(eq(releaseDraws.releaseId, row.id))
      release.draws = decodeDraws(stored!.values, stored!.drawCount, stored!.anchorCount)
    }
    return { component, releaseId: row.id, seriesId: row.seriesId, version: row.version, title: row.title, citation: row.citation, release }
  }))
}

/** The correlation matrix over `components` (identity where the published set says nothing). */
export async function correlationFor(scenario: string, components: string[]) {
  const db = await useDb()
  const [set] = await db.select().from(correlationSets)
    .where(and(eq(correlationSets.scenario, scenario), eq(correlationSets.state, 'published')))
    .orderBy(desc(correlationSets.publishedAt)).limit(1)
  if (!set) return { set: null, matrix: null }
  const matrix = components.map((a, i) => components.map((b, j) => {
    if (i === j) return 1
    const p = set.components.indexOf(a)
    const q = set.components.indexOf(b)
    return p >= 0 && q >= 0 ? set.matrix[p]![q]! : 0
  }))
  return { set, matrix }
}

export interface SiteScale { factor: number, gridId: string | null, note: string | null }

/** Each component's scale factor at a point: the latest published grid covering it, else 1. */
export async function scaleFactorsAt(latitude: number, longitude: number): Promise<Map<string, SiteScale>> {
  const db = await useDb()
  const grids = await db.select().from(scaleFactorGrids).where(eq(scaleFactorGrids.state, 'published')).orderBy(desc(scaleFactorGrids.publishedAt))
  const factors = new Map<string, SiteScale>()
  for (const component of COMPONENTS) {
    const grid = grids.find(g => g.component === component && interpolateFactor(g, latitude, longitude) !== null)
    factors.set(component, grid
      ? { factor: Math.round(interpolateFactor(grid, latitude, longitude)! * 1000) / 1000, gridId: grid.id, note: `${grid.title}, version ${grid.version}` }
      : { factor: 1, gridId: null, note: null })
  }
  return factors
}
