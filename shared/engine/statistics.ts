// Summaries read from mergeable counts.

/** Monte Carlo standard error of a proportion p estimated from n samples. */
export function proportionStandardError(p: number, n: number): number {
  return n > 0 ? Math.sqrt(Math.max(0, p * (1 - p)) / n) : 0
}

export interface HistogramView {
  counts: Uint32Array
  /** Cell of the underflow; bins follow, then the overflow cell. */
  offset: number
  bins: number
  low: number
  resolution: number
  total: number
  /** Exact extremes, so interpolation never reports a value no sample reached. */
  minimum: number
  maximum: number
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
  } else {
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
