import { samplerTables } from './sampler-tables'
import { addWeightAboveAtKnots, annualCounts } from './tile-triggers'
import { histogramQuantile, proportionStandardError, type HistogramView } from './statistics'
import { COMPONENT_KIND_DRAWS } from './types'
import type {
  Estimate,
  ObservationUpdate,
  OutlookPartial,
  OutlookPlan,
  UpdatedThreshold,
  UpdatedYear,
} from './types'

/**
 * Fewer effective samples than this and the update is refused. With 200, a chance of one half carries a
 * Monte Carlo SE of 3.5 points and the 17th percentile's level one of 2.7 points, about the precision
 * the page shows; below it a few trajectories carry the weight, the Kish size itself is unreliable
 * (it sees only the weights drawn, not the mass the prior never reached), and the numbers are noise.
 * Fixed rather than a share of N: what makes the numbers trustworthy is the effective count itself.
 */
export const MIN_EFFECTIVE_SAMPLES = 200

/**
 * The outlook conditioned on the observed record, from the merged weighted sums (see
 * `ObservationPlan`): weighted mean, sd and percentiles per output year, and per mean-sea-level threshold
 * the weighted chances and trigger years. Monte Carlo SEs use the effective sample size in place of N
 * (the usual approximation for self-normalised importance sampling).
 */
export function finishObservationUpdate(
  plan: OutlookPlan,
  merged: OutlookPartial,
  percentileLevels: readonly number[],
): ObservationUpdate | undefined {
  const observations = plan.observations
  if (!observations) return undefined
  const sums = merged.weighted
  const total = sums[0]!
  const ess = total > 0 ? (total * total) / sums[1]! : 0
  const about = {
    method: 'likelihood-weighting' as const,
    observations: observations.count,
    firstTime: observations.firstTime,
    lastTime: observations.lastTime,
    residualSd: observations.residualSd,
    phi: observations.phi,
    ess,
    minimumEss: MIN_EFFECTIVE_SAMPLES,
  }
  if (!(ess >= MIN_EFFECTIVE_SAMPLES))
    return { ...about, refused: true, reason: 'too-few-effective-samples' }

  const counts = sums.subarray(observations.histogramAt)
  const cumulative = runningTotals(plan, counts)
  const columns = plan.basisCount
  const mean = (j: number) => sums[observations.momentsAt + j]! / total
  const cross = (j: number, k: number) =>
    sums[observations.momentsAt + columns + Math.max(j, k) * columns + Math.min(j, k)]! / total
  // The rows the weights were summed over: plain level sums with uploaded draws, else the centred basis.
  const levels = plan.kinds.includes(COMPONENT_KIND_DRAWS)
  const cells = weightedCells(plan, merged.weighted, observations.cellsAt, observations.histogramAt)
  const cellsPerYear = plan.cuts.length + 1
  const byYear: UpdatedYear[] = plan.years.map((year, t) => {
    // rise − center = δ + Σ_j W_j·x_j, so its weighted mean and mean square follow from the row sums.
    const offset = (levels ? plan.landIntercept[t]! : plan.center[t]!) - plan.center[t]!
    let linear = 0
    let quadratic = 0
    for (let j = 0; j < columns; j++) {
      const wj = plan.basisWeight[t * columns + j]!
      if (wj === 0) continue
      linear += wj * mean(j)
      for (let k = 0; k < columns; k++) {
        const wk = plan.basisWeight[t * columns + k]!
        if (wk !== 0) quadratic += wj * wk * cross(j, k)
      }
    }
    const meanDeviation = offset + linear
    const meanSquare = offset * offset + 2 * offset * linear + quadratic
    const variance = Math.max(0, meanSquare - meanDeviation * meanDeviation)
    const sd = Math.sqrt((variance * ess) / (ess - 1))
    const view: HistogramView = {
      counts,
      offset: plan.histogramOffset[t]!,
      bins: plan.histogramBins[t]!,
      low: plan.histogramLow[t]!,
      resolution: plan.histogramResolution,
      total,
      minimum: merged.minimum[t]!,
      maximum: merged.maximum[t]!,
      cumulative,
    }
    return {
      year,
      mean: { value: plan.center[t]! + meanDeviation, se: sd / Math.sqrt(ess) },
      sd,
      percentiles: percentileLevels.map((level) => {
        const spread = proportionStandardError(level, ess)
        return {
          level,
          value: histogramQuantile(view, level),
          se: (histogramQuantile(view, level + spread) - histogramQuantile(view, level - spread)) / 2,
        }
      }),
    }
  })

  const trigger = plan.trigger
  const counted = trigger ? trigger.heights.length : 0
  const thresholds: UpdatedThreshold[] = []
  const weightAbove = (m: number, t: number) => {
    const cut = plan.thresholds[trigger!.thresholdIndex[m]!]!.cutIndex!
    let weight = 0
    for (let cell = cut + 1; cell < cellsPerYear; cell++) weight += cells[t * cellsPerYear + cell]!
    return weight
  }
  // A copy: the merged sums stay as the run left them, so finishing twice gives the same numbers.
  const triggerLength = counted * (trigger ? trigger.yearCount + 1 : 0)
  const triggerCounts = sums.slice(observations.triggerAt, observations.triggerAt + triggerLength)
  if (trigger) addWeightAboveAtKnots(plan, triggerCounts, 0, weightAbove)
  for (let m = 0; m < counted; m++) {
    const threshold = plan.thresholds[trigger!.thresholdIndex[m]!]!
    const above = (t: number) => weightAbove(m, t)
    const annual = annualCounts(plan, triggerCounts, m, above, total)
    thresholds.push({
      key: threshold.key,
      height: threshold.height,
      byYear: plan.years.map((_, t): Estimate => {
        const value = Math.min(1, Math.max(0, above(t) / total))
        return { value, se: proportionStandardError(value, ess) }
      }),
      triggerYears: plan.tolerances.map((tolerance) => {
        const index = annual.findIndex(weight => weight / total >= tolerance)
        return { tolerance, year: index < 0 ? null : trigger!.firstYear + index }
      }),
    })
  }
  return { ...about, refused: false, byYear, thresholds }
}

/**
 * Weighted exceedance cells per year: the weights placed one by one (samples in histogram cells that
 * hold a cut) plus, as `finishCounts` does for counts, each other histogram cell's weight in its cell.
 */
function weightedCells(plan: OutlookPlan, sums: Float64Array, cellsAt: number, histogramAt: number): Float64Array {
  const cellsPerYear = plan.cuts.length + 1
  const cells = sums.slice(cellsAt, cellsAt + plan.years.length * cellsPerYear)
  const cellOfBin = samplerTables(plan).cellOfBin
  for (let t = 0; t < plan.years.length; t++) {
    const at = plan.histogramOffset[t]!
    const end = at + plan.histogramBins[t]! + 1
    for (let bin = at; bin <= end; bin++) {
      const cell = cellOfBin[bin]!
      if (cell >= 0) cells[t * cellsPerYear + cell]! += sums[histogramAt + bin]!
    }
  }
  return cells
}

/** Running weight totals of each year's histogram cells (see `cumulativeCounts`), for look-ups by bisection. */
function runningTotals(plan: OutlookPlan, counts: Float64Array): Float64Array {
  const cumulative = new Float64Array(plan.histogramSize)
  for (let t = 0; t < plan.years.length; t++) {
    let total = 0
    const end = plan.histogramOffset[t]! + plan.histogramBins[t]! + 1
    for (let k = plan.histogramOffset[t]!; k <= end; k++) {
      total += counts[k]!
      cumulative[k] = total
    }
  }
  return cumulative
}
