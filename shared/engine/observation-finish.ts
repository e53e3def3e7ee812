import { annualCounts } from './tile-triggers'
import { histogramQuantile, proportionStandardError, type HistogramView } from './statistics'
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
  const byYear: UpdatedYear[] = plan.years.map((year, t) => {
    const meanDeviation = sums[observations.momentsAt + 2 * t]! / total
    const variance = Math.max(0, sums[observations.momentsAt + 2 * t + 1]! / total - meanDeviation * meanDeviation)
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
  for (let m = 0; m < counted; m++) {
    const threshold = plan.thresholds[trigger!.thresholdIndex[m]!]!
    const above = (t: number) => sums[observations.exceedAt + t * counted + m]!
    const annual = annualCounts(plan, sums, m, above, total, observations.triggerAt)
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
