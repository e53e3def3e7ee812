import { samplerTables } from './sampler-tables'
import { addWeightAboveAtKnots, annualCounts } from './tile-triggers'
import { blendedEffectiveSize, carriedShare, recordReach } from './observation-reach'
import { histogramQuantile, proportionStandardError, type HistogramView } from './statistics'
import { COMPONENT_KIND_DRAWS } from './types'
import type {
  Estimate,
  ObservationUpdate,
  OutlookPartial,
  OutlookPlan,
  UpdatedThreshold,
  UpdatedYear,
  YearOutlook,
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
 * the weighted chances and trigger years, each read as far ahead as the record reaches
 * (`observation-reach.ts`: beyond it, blended with the outlook's own `plainByYear`, histogram running
 * totals `plainCumulative` and counts). Monte Carlo SEs use the effective sample size in place of N (the
 * usual approximation for self-normalised importance sampling).
 */
export function finishObservationUpdate(
  plan: OutlookPlan,
  merged: OutlookPartial,
  percentileLevels: readonly number[],
  plainByYear: readonly Pick<YearOutlook, 'mean' | 'sd'>[],
  plainCumulative: ArrayLike<number>,
): ObservationUpdate | undefined {
  const observations = plan.observations
  if (!observations) return undefined
  const sums = merged.weighted
  const total = sums[0]!
  const ess = total > 0 ? (total * total) / sums[1]! : 0
  const reach = recordReach(observations)
  const about = {
    method: 'likelihood-weighting' as const,
    observations: observations.count,
    firstTime: observations.firstTime,
    lastTime: observations.lastTime,
    residualSd: observations.residualSd,
    phi: observations.phi,
    ess,
    minimumEss: MIN_EFFECTIVE_SAMPLES,
    reach,
  }
  if (!(ess >= MIN_EFFECTIVE_SAMPLES))
    return { ...about, refused: true, reason: 'too-few-effective-samples' }

  const n = plan.samples
  const counts = sums.subarray(observations.histogramAt)
  const { cells, cumulative } = weightedTotals(plan, merged, observations.cellsAt, observations.histogramAt)
  const columns = plan.basisCount
  const mean = (j: number) => sums[observations.momentsAt + j]! / total
  const cross = (j: number, k: number) =>
    sums[observations.momentsAt + columns + Math.max(j, k) * columns + Math.min(j, k)]! / total
  // The rows the weights were summed over: plain level sums with uploaded draws, else the centred basis.
  const levels = plan.kinds.includes(COMPONENT_KIND_DRAWS)
  const cellsPerYear = plan.cuts.length + 1
  const byYear: UpdatedYear[] = plan.years.map((year, t) => {
    const carried = carriedShare(reach, year)
    const size = blendedEffectiveSize(ess, n, carried)
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
    const weightedMean = plan.center[t]! + (offset + linear)
    const meanSquare = offset * offset + 2 * offset * linear + quadratic
    const weightedVariance = Math.max(0, meanSquare - (offset + linear) ** 2)
    const view = yearView(plan, merged, t, counts, total, cumulative)
    const plainView = yearView(plan, merged, t, merged.histogram, n, plainCumulative)
    const blended = carried === 1
      ? view
      : carried === 0 ? plainView : blendedView(view, plainView, carried, occupiedBins(plan, merged, t))
    const { mean: blendedMean, variance } = carried === 1
      ? { mean: weightedMean, variance: weightedVariance }
      : blendedMoments(weightedMean, weightedVariance, plainByYear[t]!, n, carried)
    const sd = Math.sqrt((variance * size) / (size - 1))
    return {
      year,
      carried,
      mean: { value: blendedMean, se: sd / Math.sqrt(size) },
      sd,
      percentiles: percentileLevels.map((level) => {
        const spread = proportionStandardError(level, size)
        return {
          level,
          value: histogramQuantile(blended, level),
          se: (histogramQuantile(blended, level + spread) - histogramQuantile(blended, level - spread)) / 2,
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
  const countAbove = (m: number, t: number) => {
    const cut = plan.thresholds[trigger!.thresholdIndex[m]!]!.cutIndex!
    let count = 0
    for (let cell = cut + 1; cell < cellsPerYear; cell++) count += merged.cellCounts[t * cellsPerYear + cell]!
    return count
  }
  // A copy: the merged sums stay as the run left them, so finishing twice gives the same numbers.
  const triggerLength = counted * (trigger ? trigger.yearCount + 1 : 0)
  const triggerCounts = sums.slice(observations.triggerAt, observations.triggerAt + triggerLength)
  if (trigger) addWeightAboveAtKnots(plan, triggerCounts, 0, weightAbove)
  const blend = (year: number, weight: number, count: number) => {
    const carried = carriedShare(reach, year)
    return carried * (weight / total) + (1 - carried) * (count / n)
  }
  for (let m = 0; m < counted; m++) {
    const threshold = plan.thresholds[trigger!.thresholdIndex[m]!]!
    const weighted = annualCounts(plan, triggerCounts, m, t => weightAbove(m, t), total)
    const plain = annualCounts(plan, merged.triggerCounts, m, t => countAbove(m, t))
    thresholds.push({
      key: threshold.key,
      height: threshold.height,
      byYear: plan.years.map((year, t): Estimate => {
        const value = Math.min(1, Math.max(0, blend(year, weightAbove(m, t), countAbove(m, t))))
        return { value, se: proportionStandardError(value, blendedEffectiveSize(ess, n, carriedShare(reach, year))) }
      }),
      triggerYears: plan.tolerances.map((tolerance) => {
        const index = weighted.findIndex((weight, y) => blend(trigger!.firstYear + y, weight, plain[y]!) >= tolerance)
        return { tolerance, year: index < 0 ? null : trigger!.firstYear + index }
      }),
    })
  }
  return { ...about, refused: false, byYear, thresholds }
}

/**
 * Mean and variance of the blend: E[x] and E[x²] are the shares' mixtures (the plain sd taken back to
 * the variance of the samples, without its N − 1).
 */
function blendedMoments(
  weightedMean: number,
  weightedVariance: number,
  plain: Pick<YearOutlook, 'mean' | 'sd'>,
  n: number,
  carried: number,
): { mean: number, variance: number } {
  const plainVariance = (plain.sd * plain.sd * (n - 1)) / n
  const mean = carried * weightedMean + (1 - carried) * plain.mean.value
  const meanSquare
    = carried * (weightedVariance + weightedMean ** 2) + (1 - carried) * (plainVariance + plain.mean.value ** 2)
  return { mean, variance: Math.max(0, meanSquare - mean ** 2) }
}

/** Year t's cells of a histogram (counts or weights) with their running totals, for percentile look-ups. */
function yearView(
  plan: OutlookPlan,
  merged: OutlookPartial,
  t: number,
  counts: ArrayLike<number>,
  total: number,
  cumulative: ArrayLike<number>,
): HistogramView {
  return {
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
}

/** The blended histogram and its running totals, grown to the largest year seen (a view is read at once). */
let blendCells = new Float64Array(0)
let blendTotals = new Float64Array(0)

/**
 * The blend of a year's weighted and plain histograms (same cells): each cell's share of the weight,
 * times `carried`, plus its share of the samples, times 1 − `carried`. Only the cells the year's samples
 * reached (`occupied`, absolute indices) hold any; the view is valid until the next call.
 */
function blendedView(
  weighted: HistogramView,
  plain: HistogramView,
  carried: number,
  occupied: { from: number, to: number },
): HistogramView {
  const cells = weighted.bins + 2
  if (blendCells.length < cells) {
    blendCells = new Float64Array(cells)
    blendTotals = new Float64Array(cells)
  }
  const counts = blendCells
  const cumulative = blendTotals
  const from = occupied.from - weighted.offset
  const to = occupied.to - weighted.offset
  counts.fill(0, 0, cells)
  cumulative.fill(0, 0, from)
  const weightedShare = carried / weighted.total
  const plainShare = (1 - carried) / plain.total
  let total = 0
  for (let k = from; k <= to; k++) {
    const share = weightedShare * weighted.counts[weighted.offset + k]! + plainShare * plain.counts[plain.offset + k]!
    counts[k] = share
    total += share
    cumulative[k] = total
  }
  cumulative.fill(total, to + 1, cells)
  return { ...weighted, counts, offset: 0, total: 1, cumulative }
}

/**
 * Per year, the histogram cells its samples reached (absolute indices): from the bin of its least rise
 * to that of its greatest, found as the counting kernels find bins, and one more on each side in case
 * a rounding put an extreme sample across a bin's edge. No weight lies outside them.
 */
function occupiedBins(plan: OutlookPlan, merged: OutlookPartial, t: number): { from: number, to: number } {
  const at = plan.histogramOffset[t]!
  const lastBin = plan.histogramBins[t]! + 1
  const inverseResolution = 1 / plan.histogramResolution
  const bin = (value: number) => {
    const position = (value - plan.histogramLow[t]!) * inverseResolution + 1
    return position < 0 ? 0 : position > lastBin ? lastBin : position | 0
  }
  return {
    from: at + Math.max(0, bin(merged.minimum[t]!) - 1),
    to: at + Math.min(lastBin, bin(merged.maximum[t]!) + 1),
  }
}

/**
 * Weighted exceedance cells per year: the weights placed one by one (samples in histogram cells that
 * hold a cut) plus, as `finishCounts` does for counts, each other histogram cell's weight in its cell;
 * and, in the same pass, running weight totals of each year's histogram cells (see `cumulativeCounts`),
 * for look-ups by bisection. Only the cells a year's samples reached are read.
 */
function weightedTotals(
  plan: OutlookPlan,
  merged: OutlookPartial,
  cellsAt: number,
  histogramAt: number,
): { cells: Float64Array, cumulative: Float64Array } {
  const sums = merged.weighted
  const cellsPerYear = plan.cuts.length + 1
  const cells = sums.slice(cellsAt, cellsAt + plan.years.length * cellsPerYear)
  const cumulative = new Float64Array(plan.histogramSize)
  const cellOfBin = samplerTables(plan).cellOfBin
  for (let t = 0; t < plan.years.length; t++) {
    const { from, to } = occupiedBins(plan, merged, t)
    let total = 0
    for (let bin = from; bin <= to; bin++) {
      const weight = sums[histogramAt + bin]!
      total += weight
      cumulative[bin] = total
      const cell = cellOfBin[bin]!
      if (cell >= 0) cells[t * cellsPerYear + cell]! += weight
    }
    cumulative.fill(total, to + 1, plan.histogramOffset[t]! + plan.histogramBins[t]! + 2)
  }
  return { cells, cumulative }
}
