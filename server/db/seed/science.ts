import type { ParsedRelease } from '../../../shared/engine'
import { buildRelease } from '../../../shared/releases/content'
import { releaseBands } from '../../../shared/releases/summary'
import { splitRelease } from '../../../shared/releases/parameters'
import type { ComponentKey } from '../../../shared/types/science'
import type { Database } from '../client'
import { correlationSets, releases, scaleFactorGrids, series, storylines } from '../schema'

// The demo science group's releases: invented, plausible-looking numbers for the fictional coast,
// not taken from any assessment. Every title says "illustrative".

const BASELINE = 2020
const ANCHORS = [2050, 2100, 2150]
const LEVELS = [0.05, 0.17, 0.5, 0.83, 0.95]
export const DEMO_SCENARIOS = ['SSP1-2.6', 'SSP2-4.5', 'SSP5-8.5'] as const
/** How much more (or less) each scenario adds than the middle one, reached by 2150. */
const SCENARIO_STRENGTH: Record<(typeof DEMO_SCENARIOS)[number], number> = {
  'SSP1-2.6': 0.72,
  'SSP2-4.5': 1,
  'SSP5-8.5': 1.45,
}

const strength = (scenario: typeof DEMO_SCENARIOS[number], year: number) =>
  1 + (SCENARIO_STRENGTH[scenario] - 1) * (year - BASELINE) / (2150 - BASELINE)

/** Quantiles around a median with separate lower and upper relative spreads (right skew when upper > lower). */
function quantileRow(median: number, lower: number, upper: number): number[] {
  const z = [-1.6449, -0.9542, 0, 0.9542, 1.6449]
  return z.map(score => median * (1 + score * (score < 0 ? lower : upper)))
}

type Recipe = (scenario: (typeof DEMO_SCENARIOS)[number]) => {
  form: ParsedRelease['form']
  fields: Record<string, unknown>
}

const RECIPES: Record<ComponentKey, Recipe> = {
  'ocean-expansion': s => ({
    form: 'quantiles',
    fields: {
      levels: LEVELS,
      values: [0.09, 0.21, 0.34].map((m, a) => quantileRow(m * strength(s, ANCHORS[a]!), 0.2, 0.22)),
    },
  }),
  'glaciers': s => ({
    form: 'normal',
    fields: { mean: [0.05, 0.1, 0.14].map((m, a) => m * strength(s, ANCHORS[a]!)), sd: [0.01, 0.024, 0.034] },
  }),
  'greenland': s => ({
    form: 'quantiles',
    fields: {
      levels: LEVELS,
      values: [0.03, 0.085, 0.17].map((m, a) => quantileRow(m * strength(s, ANCHORS[a]!), 0.35, 0.55)),
    },
  }),
  'antarctica': s => ({
    form: 'lognormal',
    fields: {
      shift: [-0.05, -0.06, -0.08],
      mu: [0.08, 0.16, 0.3].map((m, a) => Math.log(m * strength(s, ANCHORS[a]!))),
      sigma: [0.3, 0.45, 0.55],
    },
  }),
  'land-water': () => ({ form: 'normal', fields: { mean: [0.015, 0.03, 0.042], sd: [0.005, 0.01, 0.015] } }),
  'regional-ocean': s => ({
    form: 'normal',
    fields: { mean: [0.01, 0.02, 0.03].map((m, a) => m * strength(s, ANCHORS[a]!)), sd: [0.02, 0.035, 0.05] },
  }),
  'other': () => ({ form: 'normal', fields: { mean: [0, 0.004, 0.008], sd: [0.004, 0.01, 0.018] } }),
}

const TITLES: Record<ComponentKey, string> = {
  'ocean-expansion': 'Ocean warming and expansion',
  'glaciers': 'Mountain glaciers',
  'greenland': 'Greenland ice sheet',
  'antarctica': 'Antarctic ice sheet',
  'land-water': 'Land-water storage',
  'regional-ocean': 'Regional ocean dynamics',
  'other': 'Other small sources',
}

const PROVENANCE = {
  method:
    'Illustrative demo release: invented numbers shaped like a published assessment, for trying Brinkwater. Not a projection.',
  citation: 'Saltglass Ice and Ocean Group (illustrative demo data), Caldwyn Coast demo, 2026.',
  licence: 'CC BY 4.0 (demo data)',
}

interface SeedPeople { organisationId: string, authorId: string, reviewerId: string }

function prepare(form: ParsedRelease['form'], fields: Record<string, unknown>) {
  const release = buildRelease({ form, unit: 'm', baselineYear: BASELINE, anchorYears: ANCHORS, ...fields })
  // Every demo recipe has a parametric or quantile form, so there are no draws to store.
  const { parameters } = splitRelease(release)
  return {
    form,
    baselineYear: release.baselineYear,
    anchorYears: release.anchorYears,
    parameters,
    summary: releaseBands(release),
  }
}

/** Releases for every component under three scenarios; Greenland SSP2-4.5 has a superseded version 1. */
export async function seedScience(tx: Pick<Database, 'insert'>, people: SeedPeople) {
  const published = new Date('2026-10-01T09:00:00Z')
  const common = {
    ...PROVENANCE,
    organisationId: people.organisationId,
    authorId: people.authorId,
    reviewerId: people.reviewerId,
    submittedAt: published,
  }
  const seriesOf = new Map<string, string>()
  for (const scenario of DEMO_SCENARIOS) {
    for (const component of Object.keys(RECIPES) as ComponentKey[]) {
      const [row] = await tx
        .insert(series)
        .values({
          component,
          scenario,
          organisationId: people.organisationId,
          title: `${TITLES[component]} (illustrative)`,
        })
        .returning({ id: series.id })
      seriesOf.set(`${scenario}/${component}`, row!.id)
      const { form, fields } = RECIPES[component](scenario)
      const twoVersions = component === 'greenland' && scenario === 'SSP2-4.5'
      if (twoVersions) {
        // Version 1 was narrower; version 2 widened the upper tail after review of new melt data.
        const narrower = {
          levels: LEVELS,
          values: [0.028, 0.075, 0.14].map((m, a) => quantileRow(m * strength(scenario, ANCHORS[a]!), 0.3, 0.4)),
        }
        await tx
          .insert(releases)
          .values({
            ...prepare('quantiles', narrower),
            ...common,
            seriesId: row!.id,
            version: 1,
            state: 'superseded',
            publishedAt: new Date('2026-03-02T09:00:00Z'),
            supersededAt: published,
          })
      }
      await tx
        .insert(releases)
        .values({
          ...prepare(form, fields),
          ...common,
          seriesId: row!.id,
          version: twoVersions ? 2 : 1,
          state: 'published',
          publishedAt: published,
        })
    }
  }

  const correlated = ['ocean-expansion', 'glaciers', 'greenland', 'antarctica']
  await tx.insert(correlationSets).values({
    scenario: 'SSP5-8.5',
    title: 'Shared warming between ocean, glaciers and ice sheets (illustrative)',
    components: correlated,
    madeForSeries: Object.fromEntries(correlated.map(component => [component, seriesOf.get(`SSP5-8.5/${component}`)!])),
    matrix: [[1, 0.4, 0.25, 0.05], [0.4, 1, 0.35, 0.05], [0.25, 0.35, 1, 0.15], [0.05, 0.05, 0.15, 1]],
    version: 1, state: 'published', publishedAt: published, ...common,
  })

  // A high-end storyline: shown beside SSP5-8.5 outlooks, never sampled with the releases.
  await tx.insert(storylines).values({
    scenario: 'SSP5-8.5',
    name: 'Early ice-sheet collapse (illustrative)',
    description:
      'Supposes that the marine parts of the Antarctic ice sheet start to retreat unstoppably around 2060 and that Greenland\'s outlet glaciers speed up: a plausible high-end case that the releases give no probability to. Invented for the demonstration.',
    baselineYear: BASELINE,
    anchorYears: ANCHORS,
    values: { antarctica: [0.12, 0.95, 2.6], greenland: [0.08, 0.3, 0.8] },
    version: 1,
    state: 'published',
    publishedAt: published,
    ...common,
  })

  await tx
    .insert(scaleFactorGrids)
    .values({
      component: 'antarctica',
      title: 'Antarctic ice-loss fingerprint, coarse (illustrative)',
      ...antarcticFingerprint(),
      version: 1,
      state: 'published',
      publishedAt: published,
      ...common,
    })
}

/**
 * An invented coarse fingerprint shaped like the real effect: below 1 near the ice sheet, above 1
 * far from it, normalised so the area-weighted mean is 1.
 */
export function antarcticFingerprint() {
  const latitudes = Array.from({ length: 13 }, (_, i) => -90 + 15 * i)
  const longitudes = Array.from({ length: 13 }, (_, j) => -180 + 30 * j)
  const raw = latitudes.map(lat =>
    longitudes.map(lon => 1.2 - 1.1 * Math.exp(-(((lat + 90) / 30) ** 2)) + 0.03 * Math.cos((lon * Math.PI) / 180)),
  )
  let sum = 0
  let weights = 0
  raw.forEach((row, i) =>
    row.forEach((f) => {
      const w = Math.cos((latitudes[i]! * Math.PI) / 180)
      sum += w * f
      weights += w
    }),
  )
  const mean = sum / weights
  return { latitudes, longitudes, factors: raw.map(row => row.map(f => Math.round((f / mean) * 1000) / 1000)) }
}
