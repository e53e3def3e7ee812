import { annualExceedance } from './flood-chance'
import { TILE_PARAMETERS } from './gumbel-uncertainty'
import { meanFromDeviations } from './statistics'
import { ROW, TILE, type TileScratch } from './tile-scratch'
import { KNOT_PASS } from './trigger-plan'
import type { Estimate, OutlookPartial, OutlookPlan } from './types'

// Annual counts for trigger years (see `TriggerPlan`). Between two knots a sample's rise is a straight
// line, so the years in which it exceeds a height form a run at one end of the interval: samples above
// at both ends count once per tile for every year between, and for a sample that crosses the height
// one division finds the run, which goes into a difference array as +1 and −1.
// The counts are exact integers (up to rounding of the crossing point itself), not interpolated chances.

/** Each knot's rise for the tile's samples at [k·TILE + i]; grown to the largest plan seen. */
let knotRise = new Float64Array(0)

/**
 * The tile's trigger counts. With `weighted` (observation-updated outlooks), each sample is also
 * counted by its weight in the same pass (`countTriggersWeighted`): the knots' rises and the side tests
 * are shared, so the weighted counts cost only their additions.
 */
export function triggerTile(
  plan: OutlookPlan,
  scratch: TileScratch,
  tileCount: number,
  counts: Int32Array,
  weighted: { weights: Float64Array, into: Float64Array, at: number } | null = null,
): void {
  const trigger = plan.trigger!
  const knotCount = trigger.knotYears.length
  if (knotRise.length < knotCount * TILE) knotRise = new Float64Array(knotCount * TILE)
  const rise = knotRise
  const rows = scratch.rows
  const rowsAt = scratch.sumsAt
  const intercepts = scratch.sumsAreLevels ? trigger.knotLandIntercept : trigger.knotCenter
  // Knot 0 is the baseline year, where every trajectory's rise is exactly zero.
  rise.fill(0, 0, tileCount)
  const columns = trigger.knotColumns
  const weights = trigger.knotColumnWeight
  for (let k = 1; k < knotCount; k++) {
    const out = k * TILE
    const intercept = intercepts[k]!
    // Four columns per pass, the first pass starting from the intercept (padding reads the zero row).
    for (let c = trigger.knotColumnStart[k]!; c < trigger.knotColumnStart[k + 1]!; c += KNOT_PASS) {
      const b0 = rowsAt + columns[c]! * ROW
      const b1 = rowsAt + columns[c + 1]! * ROW
      const b2 = rowsAt + columns[c + 2]! * ROW
      const b3 = rowsAt + columns[c + 3]! * ROW
      const w0 = weights[c]!
      const w1 = weights[c + 1]!
      const w2 = weights[c + 2]!
      const w3 = weights[c + 3]!
      if (c === trigger.knotColumnStart[k]) {
        for (let i = 0; i < tileCount; i = (i + 1) | 0) {
          rise[(out + i) | 0]
            = intercept
              + w0 * rows[(b0 + i) | 0]!
              + w1 * rows[(b1 + i) | 0]!
              + w2 * rows[(b2 + i) | 0]!
              + w3 * rows[(b3 + i) | 0]!
        }
      }
      else {
        for (let i = 0; i < tileCount; i = (i + 1) | 0) {
          rise[(out + i) | 0]
            = rise[(out + i) | 0]!
              + w0 * rows[(b0 + i) | 0]!
              + w1 * rows[(b1 + i) | 0]!
              + w2 * rows[(b2 + i) | 0]!
              + w3 * rows[(b3 + i) | 0]!
        }
      }
    }
  }
  if (weighted) countTriggersWeighted(plan, tileCount, counts, weighted.weights, weighted.into, weighted.at)
  else countTriggers(plan, tileCount, counts)
}

/** The difference-array counts of every counted threshold from the knots' rises (see `triggerTile`). */
function countTriggers(plan: OutlookPlan, tileCount: number, counts: Int32Array): void {
  const trigger = plan.trigger!
  const knotCount = trigger.knotYears.length
  const rise = knotRise
  const stride = trigger.yearCount + 1
  for (let m = 0; m < trigger.heights.length; m++) {
    const height = trigger.heights[m]!
    const base = m * stride
    for (let k = 1; k < knotCount; k++) {
      const span = trigger.knotYears[k]! - trigger.knotYears[k - 1]!
      // Cell of the interval's start year; offset o ∈ 1 … span is year start + o.
      const at = base + trigger.knotYears[k - 1]! - trigger.firstYear
      const fromAt = (k - 1) * TILE
      const toAt = k * TILE
      const countEnd = trigger.knotIsOutput[k] === 0
      // Most samples lie on one side of the height at both ends: above at both, every year between is
      // above (the rise is a straight line), counted once for the tile; below at both, none is. Only
      // samples that cross it inside the interval need the crossing year.
      let through = 0
      let ends = 0
      for (let i = 0; i < tileCount; i++) {
        const r0 = rise[fromAt + i]!
        const r1 = rise[toAt + i]!
        const above0 = r0 > height ? 1 : 0
        const above1 = r1 > height ? 1 : 0
        through += above0 & above1
        ends += above1
        // Usually well predicted: a tenth of the samples or fewer cross a height within one interval.
        if (above0 === above1) continue
        // Offsets o strictly inside whose rise r0 + (r1 − r0)·o/span exceeds the height: after the
        // crossing when rising, before it when falling.
        const crossing = ((height - r0) * span) / (r1 - r0)
        let first = 1
        let last = span - 1
        if (above1 === 1) first = crossing >= 1 ? Math.floor(crossing) + 1 : 1
        else last = crossing < span ? Math.ceil(crossing) - 1 : span - 1
        if (first <= last) {
          counts[at + first]!++
          counts[at + last + 1]!--
        }
      }
      if (span > 1) {
        counts[at + 1]! += through
        counts[at + span]! -= through
      }
      if (countEnd) {
        counts[at + span]! += ends
        counts[at + span + 1]! -= ends
      }
    }
  }
}

/**
 * `countTriggers` and, in the same pass, each sample counted by its weight into the Float64 difference
 * arrays at `into[at …]` (observation-updated outlooks). The unweighted counts are the same integers.
 *
 * The weight above a height at both ends of an interval is not summed sample by sample when the
 * interval ends on an output year: it is the weight above at that year (the year's weighted exceedance,
 * which the counting kernels sum anyway) less the weight of the samples that rise through the height
 * inside the interval, and only those, a tenth of the samples or fewer, are added here.
 * `addWeightAboveAtKnots` adds the year's weight once the run is merged. A sum over every sample was a
 * chain of floating-point additions as long as the tile, the largest part of weighting's cost here.
 */
function countTriggersWeighted(
  plan: OutlookPlan,
  tileCount: number,
  counts: Int32Array,
  weights: Float64Array,
  into: Float64Array,
  at: number,
): void {
  const trigger = plan.trigger!
  const knotCount = trigger.knotYears.length
  const rise = knotRise
  const stride = trigger.yearCount + 1
  for (let m = 0; m < trigger.heights.length; m++) {
    const height = trigger.heights[m]!
    const base = m * stride
    for (let k = 1; k < knotCount; k++) {
      const span = trigger.knotYears[k]! - trigger.knotYears[k - 1]!
      const start = base + trigger.knotYears[k - 1]! - trigger.firstYear
      const weightedStart = at + start
      const fromAt = (k - 1) * TILE
      const toAt = k * TILE
      const endsOnOutput = trigger.knotIsOutput[k] === 1
      let through = 0
      let ends = 0
      // Weight of the samples below at the start and above at the end (output-year knots), or above
      // at both ends (other knots).
      let weightedRun = 0
      for (let i = 0; i < tileCount; i++) {
        const r0 = rise[fromAt + i]!
        const r1 = rise[toAt + i]!
        const above0 = r0 > height ? 1 : 0
        const above1 = r1 > height ? 1 : 0
        through += above0 & above1
        ends += above1
        if (!endsOnOutput) weightedRun += (above0 & above1) * weights[i]!
        if (above0 === above1) continue
        const w = weights[i]!
        if (above1 === 1 && endsOnOutput) weightedRun += w
        const crossing = ((height - r0) * span) / (r1 - r0)
        let first = 1
        let last = span - 1
        if (above1 === 1) first = crossing >= 1 ? Math.floor(crossing) + 1 : 1
        else last = crossing < span ? Math.ceil(crossing) - 1 : span - 1
        if (first <= last) {
          counts[start + first]!++
          counts[start + last + 1]!--
          into[weightedStart + first]! += w
          into[weightedStart + last + 1]! -= w
        }
      }
      if (span > 1) {
        counts[start + 1]! += through
        counts[start + span]! -= through
        const weightedThrough = endsOnOutput ? -weightedRun : weightedRun
        into[weightedStart + 1]! += weightedThrough
        into[weightedStart + span]! -= weightedThrough
      }
      if (!endsOnOutput) {
        // The weight above at the end, for knots that are not output years: a pass of its own keeps a
        // second chain of additions out of the loop above.
        let weightedEnds = 0
        for (let i = 0; i < tileCount; i++) weightedEnds += (rise[toAt + i]! > height ? 1 : 0) * weights[i]!
        counts[start + span]! += ends
        counts[start + span + 1]! -= ends
        into[weightedStart + span]! += weightedEnds
        into[weightedStart + span + 1]! -= weightedEnds
      }
    }
  }
}

/**
 * Completes the weighted difference arrays of `countTriggersWeighted` once the run is merged: for each
 * interval that ends on an output year, the weight above the height in that year (`weightAbove(m, t)`)
 * is added to the years strictly inside the interval (the samples that crossed inside it were taken
 * off there tile by tile).
 */
export function addWeightAboveAtKnots(
  plan: OutlookPlan,
  into: Float64Array,
  at: number,
  weightAbove: (m: number, t: number) => number,
): void {
  const trigger = plan.trigger!
  const stride = trigger.yearCount + 1
  for (let m = 0; m < trigger.heights.length; m++) {
    for (let k = 1; k < trigger.knotYears.length; k++) {
      const span = trigger.knotYears[k]! - trigger.knotYears[k - 1]!
      if (trigger.knotIsOutput[k] !== 1 || span <= 1) continue
      const start = at + m * stride + trigger.knotYears[k - 1]! - trigger.firstYear
      const weight = weightAbove(m, plan.years.indexOf(trigger.knotYears[k]!))
      into[start + 1]! += weight
      into[start + span]! -= weight
    }
  }
}

/**
 * Samples above each counted threshold per calendar year, from the difference array; output years take
 * the exact count of the exceedance cells (`outputCount`), the baseline year its zero rise.
 */
export function annualCounts(
  plan: OutlookPlan,
  counts: ArrayLike<number>,
  m: number,
  outputCount: (t: number) => number,
  total: number = plan.samples,
  at = 0,
): Float64Array {
  const trigger = plan.trigger!
  const stride = trigger.yearCount + 1
  const annual = new Float64Array(trigger.yearCount)
  let running = 0
  for (let y = 0; y < trigger.yearCount; y++) {
    running += counts[at + m * stride + y]!
    annual[y] = running
  }
  annual[0] = 0 > trigger.heights[m]! ? total : 0
  plan.years.forEach((year, t) => {
    annual[year - trigger.firstYear] = outputCount(t)
  })
  return annual
}

/**
 * Annual chances of the trigger plan's flood levels (`floodIndex`) in every year of the trigger range,
 * from the knots' rises `triggerTile` left for this tile: between two knots a trajectory's rise is a
 * straight line, so each year's rise is read off it, and the year's chance is the Gumbel exceedance at
 * that rise, with the trajectory's own location and scale when the parameters are uncertain (call after
 * `tileParameters`). Sums of deviations from `floodReference` and their squares go to the block's sums.
 */
export function floodAnnualTile(plan: OutlookPlan, tileCount: number, sums: Float64Array, sumOffset: number): void {
  const trigger = plan.trigger!
  const gumbel = plan.gumbel!
  const rise = knotRise
  const yearCount = trigger.yearCount
  const uncertain = gumbel.uncertainty !== null
  const parameters = TILE_PARAMETERS
  const inverseScale = 1 / gumbel.scale
  const at = sumOffset + plan.sumLayout.floodAnnual
  for (let m = 0; m < trigger.floodHeights.length; m++) {
    const height = trigger.floodHeights[m]!
    const shift = height - gumbel.location
    const row = m * yearCount
    for (let k = 0; k < trigger.knotYears.length; k++) {
      // Knot 0 (the baseline) is its own year; knot k ≥ 1 closes the interval from knot k − 1.
      const span = k === 0 ? 1 : trigger.knotYears[k]! - trigger.knotYears[k - 1]!
      const fromAt = k === 0 ? 0 : (k - 1) * TILE
      const toAt = k * TILE
      for (let o = k === 0 ? span : 1; o <= span; o++) {
        const y = trigger.knotYears[k]! - trigger.firstYear - span + o
        const fraction = o / span
        const reference = trigger.floodReference[row + y]!
        let deviations = 0
        let squares = 0
        for (let i = 0; i < tileCount; i++) {
          const r0 = rise[fromAt + i]!
          const r = r0 + (rise[toAt + i]! - r0) * fraction
          const chance = uncertain
            ? -Math.expm1(-Math.exp((r + parameters[i]! - height) * parameters[TILE + i]!))
            : annualExceedance(r, shift, inverseScale)
          const deviation = chance - reference
          deviations += deviation
          squares += deviation * deviation
        }
        sums[at + 2 * (row + y)]! += deviations
        sums[at + 2 * (row + y) + 1]! += squares
      }
    }
  }
}

/**
 * Each flood level of `trigger.floodIndex` (by threshold key): its mean annual chance in each calendar
 * year firstYear … last output year, with the standard error of that mean (per-sample chances).
 */
export function annualFloodChances(
  plan: OutlookPlan,
  merged: OutlookPartial,
): Array<{ key: string, firstYear: number, chances: Estimate[] }> {
  const trigger = plan.trigger
  if (!trigger) return []
  const yearCount = trigger.yearCount
  const totals = new Float64Array(2 * trigger.floodReference.length)
  for (let b = 0; b < merged.blocks.length; b++) {
    const at = b * plan.sumsPerBlock + plan.sumLayout.floodAnnual
    for (let j = 0; j < totals.length; j++) totals[j]! += merged.blockSums[at + j]!
  }
  return Array.from(trigger.floodIndex, (index, m) => ({
    key: plan.thresholds[index]!.key,
    firstYear: trigger.firstYear,
    chances: Array.from({ length: yearCount }, (_, y) => {
      const cell = m * yearCount + y
      const reference = trigger.floodReference[cell]!
      const estimate = meanFromDeviations(reference, totals[2 * cell]!, totals[2 * cell + 1]!, merged.samples)
      return { value: Math.min(1, Math.max(0, estimate.value)), se: estimate.se }
    }),
  }))
}
