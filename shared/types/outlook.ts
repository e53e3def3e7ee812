import type { OutlookInput } from '../engine/schema'
import type { LandDrawsSummary } from '../observations/land-motion-draws'
import type { DatumKind, LandMotionSource } from './science'

// What the `outlooks` table keeps in its jsonb columns, for the server that writes them and the pages
// that read them alike.

/**
 * How to state the engine's heights as the planner entered them: the engine works in metres above mean
 * sea level at the reference epoch, the planner above the datum.
 */
export interface OutlookDatum { name: string, kind: DatumKind, offset: number, referenceEpoch: number }

/**
 * Where an outlook's land-motion draws came from (the site's upload version and source, their summary)
 * and the release they were joint with in this outlook (null: independent of every release).
 */
export interface OutlookLandDraws {
  version: number
  source: LandMotionSource
  reference: string
  summary: LandDrawsSummary
  joint: { component: string, releaseId: string, title: string, version: number } | null
}

/**
 * The engine input as sent, plus `datum` and `landMotionDraws` (not read by the engine, part of the hash,
 * so a changed datum is a changed outlook). Outlooks stored before datums have none; outlooks whose land
 * motion is the site's rate and sigma have no `landMotionDraws`.
 */
export type StoredOutlookInput = OutlookInput & { datum?: OutlookDatum, landMotionDraws?: OutlookLandDraws }

/** One release an outlook used, with where its scale factor came from. */
export interface OutlookReleaseRef {
  component: string
  releaseId: string
  seriesId: string
  version: number
  citation: string
  title: string
  scale: number
  scaleSource: string | null
}

/** The first threshold's chance in the headline year, kept small for site lists. */
export interface OutlookHeadline {
  thresholdLabel: string
  height: number
  year: number
  probability: number
  /**
   * The first year the chance reaches each tolerance (null: not by the last year); absent on outlooks stored before it
   * was kept.
   */
  triggerYears?: Array<{ tolerance: number, year: number | null }>
}
