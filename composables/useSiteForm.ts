import type { LandMotionSource } from '#shared/types/science'
import { fromMetres, toMetres, type HeightUnit } from '#shared/units'

// The site form holds what the planner typed (heights in their chosen unit, blanks as ''); the API
// takes metres and numbers. Blanks go to the API as null so its messages name the field to fill.

type Typed = number | string
export interface ThresholdRow { label: string, height: Typed, designLifeYears: Typed }
export type ExtremesMode = 'none' | 'keep' | 'entered' | 'csv'
export interface SiteFormState {
  place: { name: string, latitude: Typed, longitude: Typed, referenceLevel: string }
  landMotion: { rate: Typed, sigma: Typed, source: LandMotionSource, reference: string, epoch: Typed }
  thresholds: ThresholdRow[]
  extremes: { mode: ExtremesMode, location: Typed, scale: Typed, csv: string }
}

/** A site as GET /api/sites/[id] returns it (the parts the form reads). */
export interface SiteRecord {
  name: string
  latitude: number
  longitude: number
  referenceLevel: string
  landMotionRate: number
  landMotionSigma: number
  landMotionSource: string
  landMotionReference: string
  landMotionEpoch: number
  gumbelLocation: number | null
  gumbelScale: number | null
  gumbelSource: string | null
  thresholds: { label: string, height: number, designLifeYears: number | null }[]
  /** The version the form was opened on, sent back as If-Match so a save never overwrites a newer one. */
  updatedAt: string
}

const inUnit = (metres: number, unit: HeightUnit) => Math.round(fromMetres(metres, unit) * 1000) / 1000
const num = (value: Typed) => (value === '' || value === null ? null : Number(value))
const metres = (value: Typed, unit: HeightUnit) => { const n = num(value); return n === null ? null : toMetres(n, unit) }

export function blankSiteForm(at: { latitude?: unknown, longitude?: unknown }): SiteFormState {
  const coordinate = (value: unknown) => (typeof value === 'string' && value !== '' && Number.isFinite(Number(value)) ? Number(value) : '')
  return {
    place: { name: '', latitude: coordinate(at.latitude), longitude: coordinate(at.longitude), referenceLevel: '' },
    landMotion: { rate: 0, sigma: 0.5, source: 'gps', reference: '', epoch: new Date().getFullYear() },
    thresholds: [{ label: '', height: '', designLifeYears: '' }],
    extremes: { mode: 'none', location: '', scale: '', csv: '' },
  }
}

export function siteFormFrom(site: SiteRecord, unit: HeightUnit): SiteFormState {
  const hasExtremes = site.gumbelLocation !== null && site.gumbelScale !== null
  return {
    place: { name: site.name, latitude: site.latitude, longitude: site.longitude, referenceLevel: site.referenceLevel },
    landMotion: { rate: site.landMotionRate, sigma: site.landMotionSigma, source: site.landMotionSource as LandMotionSource, reference: site.landMotionReference, epoch: site.landMotionEpoch },
    thresholds: site.thresholds.map(t => ({ label: t.label, height: inUnit(t.height, unit), designLifeYears: t.designLifeYears ?? '' })),
    extremes: {
      mode: hasExtremes ? 'keep' : 'none',
      location: hasExtremes ? inUnit(site.gumbelLocation!, unit) : '',
      scale: hasExtremes ? inUnit(site.gumbelScale!, unit) : '',
      csv: '',
    },
  }
}

/** The body of POST /api/sites and PATCH /api/sites/[id]. */
export function siteBody(form: SiteFormState, unit: HeightUnit) {
  const { place, landMotion, extremes } = form
  return {
    name: place.name,
    latitude: num(place.latitude),
    longitude: num(place.longitude),
    referenceLevel: place.referenceLevel,
    landMotion: { rateMmPerYear: num(landMotion.rate), sigmaMmPerYear: num(landMotion.sigma), source: landMotion.source, reference: landMotion.reference, epoch: num(landMotion.epoch) },
    thresholds: form.thresholds.map(t => ({ label: t.label, height: metres(t.height, unit), designLifeYears: num(t.designLifeYears) })),
    // Left out, the stored statistics stay as they are (kept, or about to be replaced by a CSV fit).
    gumbel: extremes.mode === 'entered' ? { location: metres(extremes.location, unit), scale: metres(extremes.scale, unit) }
      : extremes.mode === 'none' ? null : undefined,
  }
}

/** Heights typed in one unit, re-expressed when the reader switches units mid-form. */
export function convertFormHeights(form: SiteFormState, from: HeightUnit, to: HeightUnit) {
  const convert = (value: Typed) => (value === '' ? '' : inUnit(toMetres(Number(value), from), to))
  for (const row of form.thresholds) row.height = convert(row.height)
  form.extremes.location = convert(form.extremes.location)
  form.extremes.scale = convert(form.extremes.scale)
}
