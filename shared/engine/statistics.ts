import type { Estimate } from './types'

// Summaries read from mergeable counts and sums.

/**
 * A variance below this fraction of the mean square it is taken from is what rounding leaves of the
 * difference of two sums over up to two million samples (each adds a relative error of 2⁻⁵³).
 */
const CANCELLATION = 1e-9

/** Monte Carlo standard error of a proportion p estimated from n samples. */
export function proportionStandardError(p: number, n: number): number {
  return n > 0 ? Math.sqrt(Math.max(0, p * (1 - p)) / n) : 0
}

/**
 * Mean of per-sample values from Σd and Σd² of their deviations d from `reference`, with the standard
 * error of a mean, √(s²/N). Taken about a reference near the values, so values without spread (a rise
 * with no uncertainty) have deviations of exactly zero and report a standard error of 0.
 */
export function meanFromDeviations(reference: number, sum: number, squares: number, n: number): Estimate {
  const meanDeviation = sum / n
  const meanSquare = squares / n
  const spread = meanSquare - meanDeviation * meanDeviation
  const variance = spread > CANCELLATION * meanSquare ? spread : 0
  return { value: reference + meanDeviation, se: n > 1 ? Math.sqrt(variance / (n - 1)) : 0 }
}

export interface HistogramView {
  counts: ArrayLike<number>
  /** Cell of the underflow; bins follow, then the overflow cell. */
  offset: number
  bins: number
  low: number
  resolution: number
  total: number
  /** Exact extremes, so interpolation never reports a value no sample reached. */
  minimum: number
  maximum: number
  /** Optional running totals of `counts` within the year (inclusive, same offsets): rank look-ups by bisection. */
  cumulative?: ArrayLike<number>
}

/**
 * Running totals of each year's histogram cells, restarting at every year's underflow cell (exact: a
 * year holds at most 2,000,000 samples). Written into `into` when it has the right length (finishing
 * is synchronous, so a caller may reuse one array), otherwise into a new array.
 */
export function cumulativeCounts(
  counts: Uint32Array,
  offsets: ArrayLike<number>,
  bins: ArrayLike<number>,
  into?: Uint32Array,
): Uint32Array {
  const cumulative = into?.length === counts.length ? into : new Uint32Array(counts.length)
  for (let t = 0; t < offsets.length; t++) {
    let total = 0
    const end = offsets[t]! + bins[t]! + 1
    for (let k = offsets[t]!; k <= end; k++) {
      total += counts[k]!
      cumulative[k] = total
    }
  }
  return cumulative
}

/**
 * Value below which a fraction `level` of the samples lies, interpolating linearly inside the bin that
 * holds rank level·N: accurate to one bin width.
 */
export function histogramQuantile(view: HistogramView, level: number): number {
  const target = Math.min(Math.max(level, 0), 1) * view.total
  const { counts, offset, bins, low, resolution } = view
  let below = counts[offset]!
  let value: number
  if (target <= below) {
    value = view.minimum
  }
  else if (view.cumulative) {
    // First bin whose running total reaches the target: the same bin, and the same integers, as the scan.
    const cumulative = view.cumulative
    let lowK = 1
    let highK = bins + 1
    while (lowK < highK) {
      const middle = (lowK + highK) >>> 1
      if (cumulative[offset + middle]! >= target) highK = middle
      else lowK = middle + 1
    }
    if (lowK <= bins) {
      const count = counts[offset + lowK]!
      below = cumulative[offset + lowK]! - count
      value = low + (lowK - 1 + (target - below) / count) * resolution
    }
    else {
      value = view.maximum
    }
  }
  else {
    value = view.maximum
    for (let k = 1; k <= bins; k++) {
      const count = counts[offset + k]!
      if (count > 0 && below + count >= target) {
        value = low + (k - 1 + (target - below) / count) * resolution
        break
      }
      below += count
    }
  }
  return Math.min(Math.max(value, view.minimum), view.maximum)
}

/**
 * Standard error of a percentile from the binomial spread of its order statistic: half the distance
 * between the values at levels p ± √(p(1−p)/N). Cheap, distribution-free, and honest about the tails.
 */
export function percentileStandardError(view: HistogramView, level: number): number {
  const spread = proportionStandardError(level, view.total)
  return (histogramQuantile(view, level + spread) - histogramQuantile(view, level - spread)) / 2
}
