import { designLifeLevel, gridDesignLifeLevel } from './design-life'
import { LIFE_GRID_POINTS } from './gumbel-uncertainty'
import { finishObservationUpdate } from './observation-finish'
import { annualCounts } from './tile-triggers'
import {
  cumulativeCounts,
  histogramQuantile,
  meanFromDeviations,
  percentileStandardError,
  proportionStandardError,
  type HistogramView,
} from './statistics'
import type {
  Estimate,
  FloodLevelOutlook,
  OutlookPartial,
  OutlookPlan,
  OutlookResult,
  ThresholdOutlook,
  ThresholdPlan,
  YearGumbel,
  YearOutlook,
} from './types'

export const PERCENTILE_LEVELS = [0.01, 0.05, 0.17, 0.5, 0.83, 0.95, 0.99] as const

/** Zero events in N trials: the one-sided 95 % upper bound on their chance is about 3/N. */
const RULE_OF_THREE = 3

/** Variance below this (m²) means the rise has no spread, e.g. in the baseline year. */
const NO_SPREAD = 1e-24

/** A component with at least this variance share in a year counts for extrapolation (README, "Extrapolated"). */
const EXTRAPOLATION_SHARE = 0.05
const LEVEL_TOLERANCE = 1e-12

/**
 * Whether the rise's level `level` in a year lies beyond the published levels of a quantile-form
 * component that carries a non-negligible share of that year's variance.
 */
function extrapolated(plan: OutlookPlan, varianceShare: Record<string, number> | null, level: number): boolean {
  if (varianceShare === null) return false
  for (let c = 0; c < plan.componentKeys.length; c++) {
    const low = plan.publishedLevels[2 * c]!
    const high = plan.publishedLevels[2 * c + 1]!
    // The tolerance keeps a level on the edge (0.05 against 1 − 0.95) inside.
    if (
      (level < low - LEVEL_TOLERANCE || level > high + LEVEL_TOLERANCE)
      && varianceShare[plan.componentKeys[c]!]! >= EXTRAPOLATION_SHARE
    )
      return true
  }
  return false
}

/** Totals over all blocks, added in block order so the result does not depend on how blocks were split. */
function totalSums(plan: OutlookPlan, partial: OutlookPartial): Float64Array {
  const totals = new Float64Array(plan.sumsPerBlock)
  for (let b = 0; b < partial.blocks.length; b++) {
    const at = b * plan.sumsPerBlock
    for (let k = 0; k < plan.sumsPerBlock; k++) totals[k]! += partial.blockSums[at + k]!
  }
  return totals
}

/**
 * A proportion of samples with its binomial SE; a count of 0 or N (SE 0) also gets the rule of three's
 * one-sided 95 % bound, −ln(0.05)/N ≈ 3/N.
 */
function proportion(count: number, n: number): Estimate {
  const value = count / n
  const estimate: Estimate = { value, se: proportionStandardError(value, n) }
  if (count === 0) estimate.upperBound95 = Math.min(1, RULE_OF_THREE / n)
  else if (count === n) estimate.lowerBound95 = Math.max(0, 1 - RULE_OF_THREE / n)
  return estimate
}

/**
 * An averaged chance of exactly 0 (or 1) has no spread to take an SE from, yet N samples only show
 * that the rise reached a region where the chance is not negligible in fewer than about 3 of N
 * trajectories (95 %, one-sided): each per-sample chance is at most 1, so the mean is at most about
 * 3/N. The same rule of three as a count of 0.
 */
function withEdgeBounds(estimate: Estimate, n: number): Estimate {
  if (estimate.value === 0) estimate.upperBound95 = Math.min(1, RULE_OF_THREE / n)
  else if (estimate.value === 1) estimate.lowerBound95 = Math.max(0, 1 - RULE_OF_THREE / n)
  return estimate
}

/** A mean chance from its deviation sums at `at` (see `SumLayout`); rounding may not take it outside [0, 1]. */
function meanChance(reference: number, sums: Float64Array, at: number, n: number): Estimate {
  const estimate = meanFromDeviations(reference, sums[at]!, sums[at + 1]!, n)
  return withEdgeBounds({ value: Math.min(1, Math.max(0, estimate.value)), se: estimate.se }, n)
}

/**
 * A trigger year rests on the rise's level 1 − tolerance; it is extrapolated when that level is beyond
 * a release's published levels in either output year around it (or in the last year, when the
 * tolerance is not reached: "not within the horizon" rests on the same tail).
 */
function triggerExtrapolated(
  plan: OutlookPlan,
  byYear: YearOutlook[],
  tolerance: number,
  year: number | null,
): boolean {
  const level = 1 - tolerance
  const last = plan.years.length - 1
  const after = year === null ? last : plan.years.findIndex(y => y >= year)
  const around = after <= 0 ? [Math.max(0, after)] : [after - 1, after]
  return around.some(t => extrapolated(plan, byYear[t]!.varianceShare, level))
}

/**
 * The histograms' running totals, kept between calls of the same size: finishing is synchronous and
 * no view outlives its call, and a pooled request would otherwise allocate (and collect) half a
 * megabyte on its critical path.
 */
let cumulativeScratch: Uint32Array | undefined

/** Turns the merged statistics of every block into the outlook. */
export function finishOutlook(plan: OutlookPlan, merged: OutlookPartial): OutlookResult {
  // Merging refuses a block twice, so all blocks and all samples means every block exactly once.
  if (merged.blocks.length !== plan.blockCount || merged.samples !== plan.samples) {
    throw new RangeError(
      `an outlook needs all ${plan.blockCount} blocks (${plan.samples} samples); got ${merged.blocks.length} blocks (${merged.samples} samples)`,
    )
  }
  const n = plan.samples
  const partCount = plan.partKeys.length
  const cellsPerYear = plan.cuts.length + 1
  const sums = totalSums(plan, merged)
  const layout = plan.sumLayout

  // exceedanceCounts[t][j] = samples whose rise is above cut j.
  const exceedanceCounts = plan.years.map((_, t) => {
    const counts = new Float64Array(plan.cuts.length)
    let above = 0
    for (let cell = cellsPerYear - 1; cell >= 1; cell--) {
      above += merged.cellCounts[t * cellsPerYear + cell]!
      counts[cell - 1] = above
    }
    return counts
  })

  cumulativeScratch = cumulativeCounts(merged.histogram, plan.histogramOffset, plan.histogramBins, cumulativeScratch)
  const cumulative = cumulativeScratch
  const byYear: YearOutlook[] = plan.years.map((year, t) => {
    const meanDeviation = sums[layout.moments + 2 * t]! / n
    const variance = Math.max(0, sums[layout.moments + 2 * t + 1]! / n - meanDeviation * meanDeviation)
    const sd = n > 1 ? Math.sqrt((variance * n) / (n - 1)) : 0
    const view: HistogramView = {
      counts: merged.histogram,
      offset: plan.histogramOffset[t]!,
      bins: plan.histogramBins[t]!,
      low: plan.histogramLow[t]!,
      resolution: plan.histogramResolution,
      total: n,
      minimum: merged.minimum[t]!,
      maximum: merged.maximum[t]!,
      cumulative,
    }
    let varianceShare: Record<string, number> | null = null
    if (variance > NO_SPREAD) {
      varianceShare = {}
      for (let p = 0; p < partCount; p++) {
        const at = t * partCount + p
        const covariance = sums[layout.partCross + at]! / n - (sums[layout.partSum + at]! / n) * meanDeviation
        varianceShare[plan.partKeys[p]!] = covariance / variance
      }
    }
    return {
      year,
      mean: { value: plan.center[t]! + meanDeviation, se: sd / Math.sqrt(n) },
      sd,
      percentiles: PERCENTILE_LEVELS.map(level => ({
        level,
        value: histogramQuantile(view, level),
        se: percentileStandardError(view, level),
        extrapolated: extrapolated(plan, varianceShare, level),
      })),
      exceedance: plan.heightCutIndex.length
        ? Array.from(plan.heightCutIndex, (cut) => {
            const estimate = proportion(exceedanceCounts[t]![cut]!, n)
            // Only where true: the grid has hundreds of heights a year, and most chances rest on no tail.
            if (extrapolated(plan, varianceShare, 1 - estimate.value)) estimate.extrapolated = true
            return estimate
          })
        : [],
      varianceShare,
      gumbel: yearGumbel(plan, sums, t, n),
    }
  })

  let countedIndex = 0
  const thresholds: ThresholdOutlook[] = plan.thresholds.map((threshold) => {
    const about = {
      key: threshold.key,
      height: threshold.height,
      kind: threshold.kind,
      designLifeYears: threshold.designLifeYears,
      lifeStartYear: threshold.lifeStartYear,
    }
    if (threshold.cutIndex !== null) {
      const cut = threshold.cutIndex
      const probabilities = plan.years.map((_, t) => {
        const estimate = proportion(exceedanceCounts[t]![cut]!, n)
        // P(rise > h) = p puts h at the rise's level 1 − p.
        estimate.extrapolated = extrapolated(plan, byYear[t]!.varianceShare, 1 - estimate.value)
        return estimate
      })
      const trigger = plan.trigger!
      const annual = annualCounts(plan, merged.triggerCounts, countedIndex++, t => exceedanceCounts[t]![cut]!)
      return {
        ...about,
        byYear: probabilities,
        // The first calendar year whose chance (count / N, as in byYear) reaches the tolerance.
        triggerYears: plan.tolerances.map((tolerance) => {
          const index = annual.findIndex(count => count / n >= tolerance)
          const year = index < 0 ? null : trigger.firstYear + index
          return { tolerance, year, extrapolated: triggerExtrapolated(plan, byYear, tolerance, year) }
        }),
        flood: null,
        lifeExceedance: null,
        designLifeLevel: null,
      }
    }
    return { ...about, byYear: [], triggerYears: [], ...floodThreshold(plan, merged, sums, threshold) }
  })

  const observationUpdate = finishObservationUpdate(plan, merged, PERCENTILE_LEVELS, byYear, cumulative)
  if (observationUpdate && !observationUpdate.refused) {
    // Whether the releases describe a height's tail depends on the height and the year, not on the
    // weights: an updated chance at a height the releases do not reach is as extrapolated as the
    // outlook's own, and gets no likelihood word either.
    for (const updated of observationUpdate.thresholds) {
      const plain = thresholds.find(threshold => threshold.key === updated.key)
      updated.byYear.forEach((estimate, t) => {
        if (plain?.byYear[t]?.extrapolated) estimate.extrapolated = true
      })
    }
  }
  return {
    samples: n,
    seed: plan.seed,
    blockSize: plan.blockSize,
    baselineYear: plan.baselineYear,
    years: [...plan.years],
    heights: [...plan.heights],
    percentileLevels: [...PERCENTILE_LEVELS],
    percentileResolution: plan.histogramResolution,
    partKeys: [...plan.partKeys],
    byYear,
    thresholds,
    tolerances: [...plan.tolerances],
    gumbel: plan.gumbel ? { location: plan.gumbel.location, scale: plan.gumbel.scale } : null,
    ...(observationUpdate ? { observationUpdate } : {}),
  }
}

function yearGumbel(plan: OutlookPlan, sums: Float64Array, t: number, n: number): YearGumbel | null {
  const gumbel = plan.gumbel
  if (!gumbel) return null
  const layout = plan.sumLayout
  // Sums hold exp((rise − center)/λ), so the log-sum-exp needs only the center added back.
  const meanGrowth = sums[layout.gumbelExp + t]! / n
  const allowance = plan.center[t]! + gumbel.scale * Math.log(meanGrowth)
  const amplification = Math.exp(allowance / gumbel.scale)
  // Delta method: the allowance is λ·ln of a mean, the amplification the mean times e^{center/λ}.
  const growthSe = meanFromDeviations(
    1,
    sums[layout.gumbelGrowth + 2 * t]!,
    sums[layout.gumbelGrowth + 2 * t + 1]!,
    n,
  ).se
  const settled = gumbel.heavy.unsettled[t] === 0
  const levelCount = gumbel.levels.length
  return {
    allowance,
    amplification,
    settled,
    ...(settled ? {} : { unsettledReason: 'heavy-tail' as const }),
    allowanceSe: (gumbel.scale * growthSe) / meanGrowth,
    amplificationSe: (amplification * growthSe) / meanGrowth,
    returnPeriods: gumbel.returnPeriods.map((today, r) => {
      const at = t * levelCount + r
      const annualChance = meanChance(gumbel.levelReference[at]!, sums, layout.annualChance + 2 * at, n)
      return {
        today,
        level: gumbel.levels[r]!,
        newReturnPeriod: annualChance.value > 0 ? 1 / annualChance.value : Infinity,
        annualChance,
      }
    }),
  }
}

/**
 * A flood level's outlook: per year the mean annual chance that the annual maximum exceeds it, the
 * expected exceedances a year e^{−(h−μ)/λ}·mean e^{rise/λ} (from the allowance's sums, in logs so a rise
 * far above λ does not overflow), and with a design life the chance over the life and the design-life level.
 */
function floodThreshold(
  plan: OutlookPlan,
  merged: OutlookPartial,
  sums: Float64Array,
  threshold: ThresholdPlan,
): Pick<ThresholdOutlook, 'flood' | 'lifeExceedance' | 'designLifeLevel'> {
  const gumbel = plan.gumbel!
  const layout = plan.sumLayout
  const n = plan.samples
  const levelCount = gumbel.levels.length
  const shift = threshold.height - gumbel.location
  const flood: FloodLevelOutlook = {
    annualChance: [],
    expectedPerYear: [],
    expectedPerYearSettled: [],
    returnPeriodYears: [],
  }
  plan.years.forEach((_, t) => {
    const at = t * levelCount + threshold.levelIndex!
    const chance = meanChance(gumbel.levelReference[at]!, sums, layout.annualChance + 2 * at, n)
    flood.annualChance.push(chance)
    flood.expectedPerYear.push(
      gumbel.uncertainty
        ? sums[layout.expectedCount + at]! / n
        : Math.exp((plan.center[t]! - shift) / gumbel.scale + Math.log(sums[layout.gumbelExp + t]! / n)),
    )
    flood.expectedPerYearSettled.push(gumbel.heavy.unsettled[t] === 0)
    flood.returnPeriodYears.push(chance.value > 0 ? 1 / chance.value : null)
  })
  if (threshold.lifeSpanIndex === null) return { flood, lifeExceedance: null, designLifeLevel: null }
  const none = meanChance(threshold.lifeReference!, sums, layout.lifeNoExceedance + 2 * threshold.lifeSumIndex!, n)
  const span = plan.lifeSpans[threshold.lifeSpanIndex]!
  return {
    flood,
    lifeExceedance: withEdgeBounds({ value: 1 - none.value, se: none.se }, n),
    designLifeLevel: {
      chance: threshold.designLifeChance,
      level: gumbel.uncertainty
        ? gridDesignLifeLevel(
            gumbel.uncertainty.lifeGrid[threshold.lifeSpanIndex]!,
            sums,
            layout.lifeGrid + threshold.lifeSpanIndex * LIFE_GRID_POINTS,
            n,
            threshold.designLifeChance,
          )
        : designLifeLevel(span, merged.lifeHistogram, gumbel, threshold.designLifeChance),
    },
  }
}
