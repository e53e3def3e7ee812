import { and, desc, eq, inArray } from 'drizzle-orm'
import {
  correlationAdoptions,
  correlationSets,
  releaseDraws,
  releases,
  scaleFactorGrids,
  series,
} from '~~/server/db/schema'
import { interpolateFactor } from '#shared/releases/grid'
import { COMPONENTS } from '#shared/types/science'
import { decodeDraws } from './releases'
import { adoptedReleases, otherSeries } from './adoptions'

// The published science an outlook uses for one scenario: the published release of every series
// the organisation adopted, its adopted correlation sets, and each component's scale factor at the site.

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

/**
 * The science an organisation's outlook of a scenario uses: the published release of each series it
 * adopted (adoptions.ts; adopted at the first outlook when nothing is yet).
 */
export async function scienceFor(organisationId: string, scenario: string): Promise<ScienceComponent[]> {
  const chosen = await adoptedReleases(organisationId, scenario)
  const db = await useDb()
  const ids = [...chosen.values()].map(row => row.releaseId)
  const rows = new Map(
    (
      await db
        .select({
          id: releases.id,
          form: releases.form,
          baselineYear: releases.baselineYear,
          anchorYears: releases.anchorYears,
          parameters: releases.parameters,
          citation: releases.citation,
        })
        .from(releases)
        .where(inArray(releases.id, ids))
    ).map(row => [row.id, row]),
  )
  return Promise.all(COMPONENTS.map(async (component) => {
    const adopted = chosen.get(component)!
    const row = rows.get(adopted.releaseId)!
    const release: Record<string, unknown> = {
      form: row.form,
      baselineYear: row.baselineYear,
      anchorYears: row.anchorYears,
      ...row.parameters,
    }
    if (row.form === 'samples') {
      const [stored] = await db.select().from(releaseDraws).where(eq(releaseDraws.releaseId, row.id))
      release.draws = decodeDraws(stored!.values, stored!.drawCount, stored!.anchorCount)
    }
    return {
      component,
      releaseId: row.id,
      seriesId: adopted.seriesId,
      version: adopted.version,
      title: adopted.title,
      citation: row.citation,
      release,
    }
  }))
}

/**
 * The correlation matrix over `components` (identity where the set says nothing) from the correlation
 * sets the organisation adopted for the scenario, and the components whose adopted series differ from
 * those the set was made for: the set is still applied (leaving it out would narrow the tails) and
 * the outlook says so in a note.
 */
export async function correlationFor(
  organisationId: string,
  scenario: string,
  components: string[],
  adoptedSeries: Record<string, string>,
) {
  const db = await useDb()
  const [choice] = await db
    .select({ source: correlationAdoptions.sourceOrganisationId })
    .from(correlationAdoptions)
    .where(and(eq(correlationAdoptions.organisationId, organisationId), eq(correlationAdoptions.scenario, scenario)))
  if (!choice?.source) return { set: null, matrix: null, otherSeries: [] }
  const [set] = await db
    .select()
    .from(correlationSets)
    .where(
      and(
        eq(correlationSets.organisationId, choice.source),
        eq(correlationSets.scenario, scenario),
        eq(correlationSets.state, 'published'),
      ),
    )
    .orderBy(desc(correlationSets.publishedAt))
    .limit(1)
  if (!set) return { set: null, matrix: null, otherSeries: [] }
  const matrix = components.map((a, i) =>
    components.map((b, j) => {
      if (i === j) return 1
      const p = set.components.indexOf(a)
      const q = set.components.indexOf(b)
      return p >= 0 && q >= 0 ? set.matrix[p]![q]! : 0
    }),
  )
  return { set, matrix, otherSeries: otherSeries(set.madeForSeries, adoptedSeries) }
}

export interface SiteScale { factor: number, gridId: string | null, note: string | null }

/** Each component's scale factor at a point: the latest published grid covering it, else 1. */
export async function scaleFactorsAt(latitude: number, longitude: number): Promise<Map<string, SiteScale>> {
  const db = await useDb()
  const grids = await db
    .select()
    .from(scaleFactorGrids)
    .where(eq(scaleFactorGrids.state, 'published'))
    .orderBy(desc(scaleFactorGrids.publishedAt))
  const factors = new Map<string, SiteScale>()
  for (const component of COMPONENTS) {
    const grid = grids.find(g => g.component === component && interpolateFactor(g, latitude, longitude) !== null)
    factors.set(
      component,
      grid
        ? {
            factor: Math.round(interpolateFactor(grid, latitude, longitude)! * 1000) / 1000,
            gridId: grid.id,
            note: `${grid.title}, version ${grid.version}`,
          }
        : { factor: 1, gridId: null, note: null },
    )
  }
  return factors
}
