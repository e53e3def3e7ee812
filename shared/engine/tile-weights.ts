import { PASS, type SamplerTables } from './sampler-tables'
import { ROW, TILE, type TileScratch } from './tile-scratch'
import { countWeightedTriggers } from './tile-triggers'
import type { OutlookPartial, OutlookPlan } from './types'

// Observation-updated statistics of a tile: each sample's log-likelihood under the observed record
// (`observation-plan.ts`), its weight, and the weighted histogram, moments, threshold chances and
// trigger counts. Runs once per tile after the unweighted counting, and only for plans with
// observations, so outlooks without a record run exactly the loop they ran before.

const LOG_WEIGHT = new Float64Array(TILE)
const WEIGHT = new Float64Array(TILE)
/** A year's rise for the tile's samples, formed as the counting kernels form it. */
const RISE = new Float64Array(TILE)

/** Each sample's log-likelihood, less the plan's constant, into LOG_WEIGHT; returns the tile's largest. */
function logLikelihoods(plan: OutlookPlan, scratch: TileScratch, tileCount: number): number {
  const observations = plan.observations!
  const rows = scratch.rows
  const rowsAt = scratch.sumsAreLevels ? scratch.levelsAt : scratch.basisAt
  const linear = scratch.sumsAreLevels ? observations.linearLevels : observations.linearCentred
  const out = LOG_WEIGHT
  out.fill(0, 0, tileCount)
  for (let j = 0; j < linear.length; j++) {
    const coefficient = linear[j]!
    if (coefficient === 0) continue
    const at = rowsAt + j * ROW
    for (let i = 0; i < tileCount; i = (i + 1) | 0) out[i] = out[i]! + coefficient * rows[(at + i) | 0]!
  }
  const first = observations.termFirst
  const second = observations.termSecond
  const coefficients = observations.termCoefficient
  for (let term = 0; term < coefficients.length; term++) {
    const coefficient = coefficients[term]!
    const a = rowsAt + first[term]! * ROW
    const b = rowsAt + second[term]! * ROW
    for (let i = 0; i < tileCount; i = (i + 1) | 0)
      out[i] = out[i]! + coefficient * rows[(a + i) | 0]! * rows[(b + i) | 0]!
  }
  let largest = -Infinity
  for (let i = 0; i < tileCount; i++) if (out[i]! > largest) largest = out[i]!
  return largest
}

/**
 * Year t's rise for the tile into RISE, with the same terms in the same order as `riseOfYear` and
 * `countYear` (so a sample falls in the same histogram cell as when it was counted).
 */
function riseOfTile(plan: OutlookPlan, tables: SamplerTables, scratch: TileScratch, t: number, tileCount: number) {
  const rows = scratch.rows
  const rowsAt = scratch.sumsAreLevels ? scratch.levelsAt : scratch.basisAt
  const columns = tables.yearColumns[t]!
  const weights = tables.yearWeights[t]!
  const rise = RISE
  rise.fill(scratch.sumsAreLevels ? plan.landIntercept[t]! : plan.center[t]!, 0, tileCount)
  const last = columns.length - PASS
  for (let p = 0; p < last; p += PASS) {
    const b0 = rowsAt + columns[p]! * ROW
    const b1 = rowsAt + columns[p + 1]! * ROW
    const b2 = rowsAt + columns[p + 2]! * ROW
    const b3 = rowsAt + columns[p + 3]! * ROW
    const w0 = weights[p]!
    const w1 = weights[p + 1]!
    const w2 = weights[p + 2]!
    const w3 = weights[p + 3]!
    for (let i = 0; i < tileCount; i++)
      rise[i] = rise[i]! + w0 * rows[b0 + i]! + w1 * rows[b1 + i]! + w2 * rows[b2 + i]! + w3 * rows[b3 + i]!
  }
  const b0 = rowsAt + columns[last]! * ROW
  const b1 = rowsAt + columns[last + 1]! * ROW
  const b2 = rowsAt + columns[last + 2]! * ROW
  const b3 = rowsAt + columns[last + 3]! * ROW
  const w0 = weights[last]!
  const w1 = weights[last + 1]!
  const w2 = weights[last + 2]!
  const w3 = weights[last + 3]!
  const used = w3 !== 0 ? 4 : w2 !== 0 ? 3 : 2
  for (let i = 0; i < tileCount; i++) {
    let value = rise[i]! + w0 * rows[b0 + i]! + w1 * rows[b1 + i]!
    if (used > 2) value += w2 * rows[b2 + i]!
    if (used > 3) value += w3 * rows[b3 + i]!
    rise[i] = value
  }
}

/**
 * Multiplies every weighted sum by e^{from − to} (Σw², at 1, by its square), so they are kept relative
 * to the larger scale `to`.
 */
export function rescaleWeighted(sums: Float64Array, from: number, to: number): void {
  if (from === to) return
  const factor = from === -Infinity ? 0 : Math.exp(from - to)
  for (let k = 0; k < sums.length; k++) sums[k] = sums[k]! * factor
  sums[1] = sums[1]! * factor
}

/** Weights the tile's samples by the observed record and adds them to the partial's weighted sums. */
export function weightTile(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  tileCount: number,
  partial: OutlookPartial,
): void {
  const observations = plan.observations!
  const sums = partial.weighted
  const largest = logLikelihoods(plan, scratch, tileCount)
  // The scale only grows, a few times per partial: the sums so far are rescaled then.
  if (largest > partial.weightScale) {
    rescaleWeighted(sums, partial.weightScale, largest)
    partial.weightScale = largest
  }
  const scale = partial.weightScale
  const weights = WEIGHT
  let total = 0
  let squares = 0
  for (let i = 0; i < tileCount; i++) {
    const w = Math.exp(LOG_WEIGHT[i]! - scale)
    weights[i] = w
    total += w
    squares += w * w
  }
  sums[0]! += total
  sums[1]! += squares

  const inverseResolution = 1 / plan.histogramResolution
  const trigger = plan.trigger
  const counted = trigger ? trigger.heights.length : 0
  const rise = RISE
  for (let t = 0; t < plan.years.length; t++) {
    if (tables.constantYear[t]) rise.fill(plan.landIntercept[t]!, 0, tileCount)
    else riseOfTile(plan, tables, scratch, t, tileCount)
    const center = plan.center[t]!
    const low = plan.histogramLow[t]!
    const lastBin = plan.histogramBins[t]! + 1
    const histogramAt = observations.histogramAt + plan.histogramOffset[t]!
    let moment = 0
    let square = 0
    for (let i = 0; i < tileCount; i++) {
      const value = rise[i]!
      const w = weights[i]!
      const deviation = value - center
      moment += w * deviation
      square += w * deviation * deviation
      let bin = (value - low) * inverseResolution + 1
      bin = bin < 0 ? 0 : bin > lastBin ? lastBin : bin | 0
      sums[histogramAt + bin]! += w
    }
    sums[observations.momentsAt + 2 * t]! += moment
    sums[observations.momentsAt + 2 * t + 1]! += square
    for (let m = 0; m < counted; m++) {
      const height = trigger!.heights[m]!
      let above = 0
      for (let i = 0; i < tileCount; i++) if (rise[i]! > height) above += weights[i]!
      sums[observations.exceedAt + t * counted + m]! += above
    }
  }
  if (trigger) countWeightedTriggers(plan, tileCount, weights, sums, observations.triggerAt)
}
