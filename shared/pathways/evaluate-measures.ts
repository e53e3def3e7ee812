import { finishOutlook, planOutlook, runBlocks } from '../engine'
import { annualCounts } from '../engine/tile-triggers'
import type { OutlookResult } from '../engine'
import { tippingFromCounts, tippingFromOutputYears, type TippingYear } from './tipping'

// Runs the engine on an outlook's own input (same science, seed and samples) with the measures'
// heights as its thresholds, and reads each height's tipping years. The trajectories are those of
// the outlook, so a measure at the height of one of the site's thresholds tips when that threshold
// triggers.

export interface MeasureHeight {
  key: string
  /** Metres above mean sea level at the outlook's baseline year (the engine's reference). */
  height: number
  kind: 'mean-sea-level' | 'flood-level'
}

export interface MeasureTipping { key: string, tipping: TippingYear[] }

export function evaluateMeasures(
  outlookInput: Record<string, unknown>,
  measures: MeasureHeight[],
  tolerances: number[],
): { horizon: number, measures: MeasureTipping[] } {
  const thresholds = measures.map(m => ({ key: m.key, height: m.height, kind: m.kind }))
  // The stored input's `datum` is provenance only; the engine ignores it.
  const plan = planOutlook({ ...outlookInput, thresholds, tolerances })
  const merged = runBlocks(plan, 0, plan.blockCount)
  const result: OutlookResult = finishOutlook(plan, merged)
  const n = result.samples
  let counted = 0
  const out = result.thresholds.map((threshold): MeasureTipping => {
    if (threshold.kind === 'flood-level') {
      const chances = threshold.flood!.annualChance
      return { key: threshold.key, tipping: tolerances.map(tol => tippingFromOutputYears(result.years, chances, tol)) }
    }
    const counts = annualCounts(plan, merged.triggerCounts, counted++, t => Math.round(threshold.byYear[t]!.value * n))
    return {
      key: threshold.key,
      tipping: tolerances.map(tol => tippingFromCounts(counts, plan.trigger!.firstYear, n, tol)),
    }
  })
  return { horizon: result.years.at(-1)!, measures: out }
}
