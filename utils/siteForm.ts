import type { DatumKind, LandMotionSource, ThresholdKind } from '#shared/types/science'
import { DEFAULT_PLANNING } from '#shared/schemas/sites'
import { fromMetres, toMetres, type HeightUnit } from '#shared/units'
import type { ApiResponse } from '~/utils/apiResponse'

// The site form holds what the planner typed (heights in their chosen unit, blanks as ''); the API
// takes metres and numbers. Blanks go to the API as null so its messages name the field to fill.

type Typed = number | string
export interface ThresholdRow {
  label: string
  height: Typed
  kind: ThresholdKind
  buildYear: Typed
  designLifeYears: Typed
}
export type ExtremesMode = 'none' | 'keep' | 'entered' | 'csv'
export interface SiteFormState {
  place: { name: string, latitude: Typed, longitude: Typed }
  /** The datum's name is the site's reference level; its offset is a height (in the chosen unit). */
  datum: { kind: DatumKind, name: string, offset: Typed, referenceEpoch: Typed }
  landMotion: { rate: Typed, sigma: Typed, source: LandMotionSource, reference: string, epoch: Typed }
  thresholds: ThresholdRow[]
  extremes: { mode: ExtremesMode, location: Typed, scale: Typed, csv: string }
  planning: { scenario: string, tolerance: number }
}

/**
 * A site as GET /api/sites/[id] returns it; its `updatedAt` goes back as If-Match, so a save never overwrites a newer
 * version.
 */
export type SiteRecord = ApiResponse<'/api/sites/:id'>

const inUnit = (metres: number, unit: HeightUnit) => Math.round(fromMetres(metres, unit) * 1000) / 1000
const num = (value: Typed) => (value === '' || value === null ? null : Number(value))
const metres = (value: Typed, unit: HeightUnit) => {
  const n = num(value)
  return n === null ? null : toMetres(n, unit)
}

export const blankThreshold = (): ThresholdRow => ({
  label: '',
  height: '',
  kind: 'mean-sea-level',
  buildYear: '',
  designLifeYears: '',
})

export function blankSiteForm(at: { latitude?: unknown, longitude?: unknown }): SiteFormState {
  const coordinate = (value: unknown) =>
    typeof value === 'string' && value !== '' && Number.isFinite(Number(value)) ? Number(value) : ''
  return {
    place: { name: '', latitude: coordinate(at.latitude), longitude: coordinate(at.longitude) },
    // Blank on purpose: the epoch and the datum's offset are facts of the site the planner must state.
    datum: { kind: 'mean-sea-level', name: '', offset: 0, referenceEpoch: '' },
    landMotion: { rate: 0, sigma: 0.5, source: 'gps', reference: '', epoch: '' },
    thresholds: [blankThreshold()],
    extremes: { mode: 'none', location: '', scale: '', csv: '' },
    planning: { ...DEFAULT_PLANNING },
  }
}

export function siteFormFrom(site: SiteRecord, unit: HeightUnit): SiteFormState {
  const hasExtremes = site.gumbelLocation !== null && site.gumbelScale !== null
  return {
    place: { name: site.name, latitude: site.latitude, longitude: site.longitude },
    datum: {
      kind: site.datumKind,
      name: site.referenceLevel,
      offset: inUnit(site.datumOffset, unit),
      referenceEpoch: site.referenceEpoch,
    },
    landMotion: {
      rate: site.landMotionRate,
      sigma: site.landMotionSigma,
      source: site.landMotionSource as LandMotionSource,
      reference: site.landMotionReference,
      epoch: site.landMotionEpoch,
    },
    thresholds: site.thresholds.map(t => ({
      label: t.label,
      height: inUnit(t.height, unit),
      kind: t.kind,
      buildYear: t.buildYear ?? '',
      designLifeYears: t.designLifeYears ?? '',
    })),
    extremes: {
      mode: hasExtremes ? 'keep' : 'none',
      location: hasExtremes ? inUnit(site.gumbelLocation!, unit) : '',
      scale: hasExtremes ? inUnit(site.gumbelScale!, unit) : '',
      csv: '',
    },
    planning: { scenario: site.planningScenario, tolerance: site.planningTolerance },
  }
}

/** The body of POST /api/sites and PATCH /api/sites/[id]. */
export function siteBody(form: SiteFormState, unit: HeightUnit) {
  const { place, datum, landMotion, extremes } = form
  return {
    name: place.name,
    latitude: num(place.latitude),
    longitude: num(place.longitude),
    referenceLevel: datum.name,
    datum: { kind: datum.kind, offset: metres(datum.offset, unit) },
    referenceEpoch: num(datum.referenceEpoch),
    landMotion: {
      rateMmPerYear: num(landMotion.rate),
      sigmaMmPerYear: num(landMotion.sigma),
      source: landMotion.source,
      reference: landMotion.reference,
      epoch: num(landMotion.epoch),
    },
    // A mean-sea-level threshold has no life: what the planner typed there before switching kind is dropped.
    thresholds: form.thresholds.map(t =>
      t.kind === 'flood-level'
        ? {
            label: t.label,
            height: metres(t.height, unit),
            kind: t.kind,
            buildYear: num(t.buildYear),
            designLifeYears: num(t.designLifeYears),
          }
        : { label: t.label, height: metres(t.height, unit), kind: t.kind, buildYear: null, designLifeYears: null },
    ),
    // Left out, the stored statistics stay as they are (kept, or about to be replaced by a CSV fit).
    gumbel:
      extremes.mode === 'entered'
        ? { location: metres(extremes.location, unit), scale: metres(extremes.scale, unit) }
        : extremes.mode === 'none'
          ? null
          : undefined,
    planning: { scenario: form.planning.scenario, tolerance: form.planning.tolerance },
  }
}

/** Heights typed in one unit, re-expressed when the reader switches units mid-form. */
export function convertFormHeights(form: SiteFormState, from: HeightUnit, to: HeightUnit) {
  const convert = (value: Typed) => (value === '' ? '' : inUnit(toMetres(Number(value), from), to))
  for (const row of form.thresholds) row.height = convert(row.height)
  form.datum.offset = convert(form.datum.offset)
  form.extremes.location = convert(form.extremes.location)
  form.extremes.scale = convert(form.extremes.scale)
}
