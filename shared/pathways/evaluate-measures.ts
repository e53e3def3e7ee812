import { finishOutlook, planOutlook, runBlocks, type OutlookPartial, type OutlookPlan } from '../engine'
import { annualCounts, annualFloodChances } from '../engine/tile-triggers'
import { chancesFromCounts, tippingFromChances, type AnnualChances, type TippingYear } from './tipping'

// Runs the engine on an outlook's own input (same science, seed and samples) with the measures'
// heights as its thresholds, and reads each height's chance of being exceeded in every year from the
// baseline to the horizon. The trajectories are those of the outlook, so a measure at the height of
// one of the site's thresholds tips when that threshold triggers. The server stores these chances
// (server/services/pathways/evaluation.ts) and reads tipping years at any tolerance from them.

export interface MeasureHeight {
  key: string
  /** Metres above mean sea level at the outlook's baseline year (the engine's reference). */
  height: number
  kind: 'mean-sea-level' | 'flood-level'
}

export interface MeasureChances { key: string, chances: AnnualChances }
export interface MeasureTipping { key: string, tipping: TippingYear[] }

/** The engine input and plan options that evaluate measures on an outlook's input. */
export function measuresPlan(outlookInput: Record<string, unknown>, measures: MeasureHeight[]): OutlookPlan {
  const thresholds = measures.map(m => ({ key: m.key, height: m.height, kind: m.kind }))
  // The stored input's `datum` is provenance only; the engine ignores it. Tolerances play no part.
  return planOutlook({ ...outlookInput, thresholds, tolerances: [] }, { annualFloodChances: true })
}

/** Each measure's chance in every year, from the merged partial of a `measuresPlan`. */
export function measureChances(
  plan: OutlookPlan,
  merged: OutlookPartial,
): { horizon: number, measures: MeasureChances[] } {
  const result = finishOutlook(plan, merged)
  const n = result.samples
  const floods = annualFloodChances(plan, merged)
  let counted = 0
  const measures = result.thresholds.map((threshold): MeasureChances => {
    if (threshold.kind === 'flood-level') {
      const flood = floods.find(f => f.key === threshold.key)!
      return {
        key: threshold.key,
        chances: {
          firstYear: flood.firstYear,
          value: flood.chances.map(c => c.value),
          se: flood.chances.map(c => c.se),
        },
      }
    }
    const counts = annualCounts(plan, merged.triggerCounts, counted++, t => Math.round(threshold.byYear[t]!.value * n))
    return { key: threshold.key, chances: chancesFromCounts(counts, plan.trigger!.firstYear, n) }
  })
  return { horizon: result.years.at(-1)!, measures }
}

/** Tipping years at each tolerance from stored chances. */
export function tippingOf(chances: MeasureChances[], tolerances: number[]): MeasureTipping[] {
  return chances.map(m => ({ key: m.key, tipping: tolerances.map(tol => tippingFromChances(m.chances, tol)) }))
}

/** All of the above on this thread (tests; the server runs it on its worker pool). */
export function evaluateMeasures(
  outlookInput: Record<string, unknown>,
  measures: MeasureHeight[],
  tolerances: number[],
): { horizon: number, measures: MeasureTipping[] } {
  const plan = measuresPlan(outlookInput, measures)
  const { horizon, measures: chances } = measureChances(plan, runBlocks(plan, 0, plan.blockCount))
  return { horizon, measures: tippingOf(chances, tolerances) }
}
