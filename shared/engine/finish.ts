import { gumbelReturnLevel } from './gumbel'
import { cumulativeCounts, histogramQuantile, percentileStandardError, proportionStandardError, type HistogramView } from './statistics'
import type { Estimate, OutlookPartial, OutlookPlan, OutlookResult, ThresholdOutlook, YearGumbel, YearOutlook } from './types'

export const PERCENTILE_LEVELS = [0.01, 0.05, 0.17, 0.5, 0.83, 0.95, 0.99] as const

/** Variance below this (m²) means the rise has no spread, e.g. in the baseline year. */
const NO_SPREAD = 1e-24

/** Totals over all blocks, added in block order so the result does not depend on how blocks were split. */
function totalSums(plan: OutlookPlan, partial: OutlookPartial): Float64Array {
  const totals = new Float64Array(plan.sumsPerBlock)
  for (let b = 0; b < partial.blocks.length; b++) {
    const at = b * plan.sumsPerBlock
    for (let k = 0; k < plan.sumsPerBlock; k++) totals[k]! += partial.blockSums[at + k]!
  }
  return totals
}

function proportion(count: number, n: number): Estimate {
  const value = count / n
  return { value, se: proportionStandardError(value, n) }
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
      percentiles: PERCENTILE_LEVELS.map((level) => ({
        level,
        value: histogramQuantile(view, level),
        se: percentileStandardError(view, level),
      })),
      exceedance: plan.heightCutIndex.length
        ? Array.from(plan.heightCutIndex, (cut) => proportion(exceedanceCounts[t]![cut]!, n))
        : [],
      varianceShare,
      gumbel: yearGumbel(plan, sums, t, n),
    }
  })

  const thresholds: ThresholdOutlook[] = plan.thresholds.map((threshold) => {
    const probabilities = plan.years.map((_, t) => proportion(exceedanceCounts[t]![threshold.cutIndex]!, n))
    const lifeExceedance =
      threshold.lifeSumIndex === null
        ? null
        : proportion(n - sums[layout.lifeNoExceedance + threshold.lifeSumIndex]!, n)
    return {
      key: threshold.key,
      height: threshold.height,
      designLifeYears: threshold.designLifeYears,
      byYear: probabilities,
      triggerYears: plan.tolerances.map((tolerance) => {
        const index = probabilities.findIndex((probability) => probability.value >= tolerance)
        return { tolerance, year: index < 0 ? null : plan.years[index]! }
      }),
      lifeExceedance,
    }
  })

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
  }
}

function yearGumbel(plan: OutlookPlan, sums: Float64Array, t: number, n: number): YearGumbel | null {
  const gumbel = plan.gumbel
  if (!gumbel) return null
  const layout = plan.sumLayout
  // Sums hold exp((rise − center)/λ), so the log-sum-exp needs only the center added back.
  const allowance = plan.center[t]! + gumbel.scale * Math.log(sums[layout.gumbelExp + t]! / n)
  const periods = gumbel.returnPeriods
  return {
    allowance,
    amplification: Math.exp(allowance / gumbel.scale),
    returnPeriods: periods.map((today, r) => {
      const annualChance = proportion(sums[layout.returnChance + t * periods.length + r]!, n)
      return {
        today,
        level: gumbelReturnLevel(gumbel, today),
        newReturnPeriod: annualChance.value > 0 ? 1 / annualChance.value : Infinity,
        annualChance,
      }
    }),
  }
}
