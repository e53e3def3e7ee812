import { gumbelReturnLevel } from '../../../shared/engine'
import { fitGumbelWithTrend } from '../../../shared/engine/gumbel-trend'
import type { DatumKind, LandMotionSource, ThresholdKind } from '../../../shared/types/science'
import type { Database } from '../client'
import { annualMaxima, sites, thresholds } from '../schema'
import { seedGaugeRecord, type DemoGauge } from './gauge'

// Invented towns on the invented island of Caldwyn (drawn on the map from public/map/caldwyn.geojson,
// in open ocean). Land motion, thresholds and water levels are illustrative only.

interface DemoSite {
  org: 'council' | 'port'
  name: string
  latitude: number
  longitude: number
  land: { rate: number, sigma: number, source: LandMotionSource, reference: string }
  /** Heights are above this datum; without one, above mean sea level 2020 at the town's gauge. */
  datum?: { kind: DatumKind, name: string, offset: number }
  thresholds: { label: string, height: number, kind?: ThresholdKind, buildYear?: number, designLifeYears?: number }[]
  /**
   * Annual maxima are generated from this Gumbel (location at 2020, rising with the sea) for the demo, then fitted like
   * an upload.
   */
  extremes?: { location: number, scale: number, years: number }
  /** An invented record of annual mean sea level at the town's gauge. */
  gauge?: DemoGauge
  /** The scenario its planners plan for; SSP2-4.5 (the column's default) when absent. */
  planningScenario?: string
}

/** Every demo site counts rise from 2020, the baseline of the demo science. */
const REFERENCE_EPOCH = 2020
const MSL = (gauge: string) => `Mean sea level 2020 at the ${gauge} tide gauge (illustrative)`
/** How fast the demo's annual maxima rose before 2020, metres a year (with the mean sea). */
const DEMO_MAXIMA_TREND = 0.004

export const DEMO_SITES: DemoSite[] = [
  {
    org: 'council',
    name: 'Kelwick',
    latitude: 47.62,
    longitude: -34.93,
    land: { rate: -4.8, sigma: 0.9, source: 'insar', reference: 'Caldwyn delta InSAR survey 2016–2024 (illustrative)' },
    thresholds: [
      { label: 'High-tide flooding of Quay Street', height: 0.5 },
      { label: 'Sea wall crest', height: 2.3, kind: 'flood-level', buildYear: 2031, designLifeYears: 50 },
    ],
    extremes: { location: 1.55, scale: 0.14, years: 32 },
    gauge: { firstYear: 1979, lastYear: 2025, rateMmPerYear: 8, accelerationMmPerYear2: 0.15 },
  },
  {
    org: 'council',
    name: 'Drumhaven',
    latitude: 48.93,
    longitude: -33.42,
    land: { rate: 2.1, sigma: 0.4, source: 'gps', reference: 'GNSS station DRMH, 14-year series (illustrative)' },
    thresholds: [{ label: 'Promenade', height: 0.9 }],
  },
  {
    org: 'council',
    name: 'Fennmouth',
    latitude: 47.21,
    longitude: -33.05,
    land: { rate: -1.2, sigma: 0.5, source: 'gps', reference: 'GNSS station FNMT, 11-year series (illustrative)' },
    thresholds: [
      { label: 'Flood gate sill', height: 0.6 },
      { label: 'Railway embankment', height: 1.9, kind: 'flood-level', buildYear: 2028, designLifeYears: 100 },
    ],
    extremes: { location: 1.3, scale: 0.11, years: 25 },
  },
  {
    org: 'council',
    name: 'Lowmere',
    latitude: 47.95,
    longitude: -35.72,
    land: {
      rate: -2.5,
      sigma: 1.0,
      source: 'model',
      reference: 'Regional glacial isostatic adjustment model plus compaction estimate (illustrative)',
    },
    thresholds: [{ label: 'Wastewater works inlet', height: 1.0 }],
  },
  {
    org: 'council',
    name: 'Saltcombe Ness',
    latitude: 48.55,
    longitude: -35.48,
    land: { rate: -0.4, sigma: 0.5, source: 'gps', reference: 'GNSS station SNES, 9-year series (illustrative)' },
    thresholds: [
      { label: 'Coast road', height: 0.7 },
      { label: 'Lifeboat slipway head', height: 1.2 },
    ],
  },
  // The harbour board works in Spanish: its planners wrote these labels and references in Spanish.
  {
    org: 'port',
    name: 'Skerrow Quay',
    latitude: 48.21,
    longitude: -32.64,
    land: {
      rate: -1.8,
      sigma: 0.6,
      source: 'gps',
      reference: 'Estación GNSS SKRW en la oficina del puerto (ilustrativa)',
    },
    datum: { kind: 'chart', name: 'Cero hidrográfico del puerto de Skerrow (ilustrativo)', offset: 1.2 },
    planningScenario: 'SSP5-8.5',
    thresholds: [
      { label: 'Plataforma del muelle', height: 2.6, kind: 'flood-level', buildYear: 2030, designLifeYears: 50 },
      { label: 'Carril de las grúas', height: 0.8 },
    ],
    extremes: { location: 1.7, scale: 0.16, years: 40 },
  },
  {
    org: 'port',
    name: 'Skerrow Breakwater',
    latitude: 48.28,
    longitude: -32.55,
    land: {
      rate: -1.6,
      sigma: 0.7,
      source: 'other',
      reference: 'Nivelación desde el punto de referencia del puerto, 2019 (ilustrativa)',
    },
    thresholds: [{ label: 'Coronación del rompeolas', height: 2.6 }],
  },
]

/** Deterministic demo maxima: the Gumbel quantiles at evenly spread, shuffled probabilities, on a rising sea. */
function demoMaxima(location: number, scale: number, years: number) {
  const firstYear = 2025 - years
  return Array.from({ length: years }, (_, i) => {
    const p = ((i * 7919) % years + 0.5) / years
    const period = 1 / (1 - p)
    const year = firstYear + i
    const moved = location + DEMO_MAXIMA_TREND * (year - REFERENCE_EPOCH)
    return { year, value: Math.round(gumbelReturnLevel({ location: moved, scale }, period) * 1000) / 1000 }
  })
}

export async function seedSites(
  tx: Pick<Database, 'insert'>,
  owners: { council: { org: string, planner: string }, port: { org: string, planner: string } },
) {
  for (const demo of DEMO_SITES) {
    const owner = owners[demo.org]
    const datum = demo.datum ?? { kind: 'mean-sea-level', name: MSL(demo.name), offset: 0 }
    // Demo extremes are stated above mean sea level; a site on another datum stores them above its datum.
    const maxima = demo.extremes
      ? demoMaxima(demo.extremes.location, demo.extremes.scale, demo.extremes.years).map(m => ({
          ...m,
          value: Math.round((m.value + datum.offset) * 1000) / 1000,
        }))
      : null
    const fit = maxima ? fitGumbelWithTrend(maxima, REFERENCE_EPOCH) : null
    const [site] = await tx
      .insert(sites)
      .values({
        organisationId: owner.org,
        createdBy: owner.planner,
        name: demo.name,
        latitude: demo.latitude,
        longitude: demo.longitude,
        referenceLevel: datum.name,
        datumKind: datum.kind,
        datumOffset: datum.offset,
        referenceEpoch: REFERENCE_EPOCH,
        landMotionRate: demo.land.rate,
        landMotionSigma: demo.land.sigma,
        landMotionSource: demo.land.source,
        landMotionReference: demo.land.reference,
        landMotionEpoch: 2020,
        ...(demo.planningScenario ? { planningScenario: demo.planningScenario } : {}),
        gumbelLocation: fit?.location ?? null,
        gumbelScale: fit?.scale ?? null,
        gumbelSource: maxima ? `fitted:${maxima.length}` : null,
        gumbelTrend: fit?.trendPerYear ?? null,
        gumbelLocationSe: fit?.se.location ?? null,
        gumbelScaleSe: fit?.se.scale ?? null,
        gumbelTrendSe: fit?.se.trendPerYear ?? null,
      })
      .returning({ id: sites.id })
    await tx.insert(thresholds).values(
      demo.thresholds.map((t, position) => ({
        siteId: site!.id,
        label: t.label,
        height: t.height + datum.offset,
        kind: t.kind ?? 'mean-sea-level',
        buildYear: t.buildYear ?? null,
        designLifeYears: t.designLifeYears ?? null,
        position,
      })),
    )
    if (maxima) await tx.insert(annualMaxima).values(maxima.map(m => ({ siteId: site!.id, ...m })))
    if (demo.gauge) await seedGaugeRecord(tx, site!.id, demo.gauge, datum.offset)
  }
}
