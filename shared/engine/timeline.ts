// Linear interpolation of a release's levels in time: zero at the release's baseline year, the
// anchor values at the anchor years, straight lines between. A year is expressed as weights on the
// anchors (the zero at the baseline carries no weight of its own).

/** Weights on each anchor for `year`, which must lie in [baselineYear, last anchor]. */
export function anchorWeights(baselineYear: number, anchorYears: number[], year: number): Float64Array {
  const weights = new Float64Array(anchorYears.length)
  if (year <= baselineYear) return weights
  const first = anchorYears[0]!
  if (year <= first) {
    weights[0] = (year - baselineYear) / (first - baselineYear)
    return weights
  }
  for (let a = 0; a + 1 < anchorYears.length; a++) {
    const from = anchorYears[a]!
    const to = anchorYears[a + 1]!
    if (year <= to) {
      const along = (year - from) / (to - from)
      weights[a] = 1 - along
      weights[a + 1] = along
      return weights
    }
  }
  weights[anchorYears.length - 1] = 1
  return weights
}

/**
 * Weights giving x(year) − x(outlookBaseline) along one trajectory, per output year: row t of the
 * result (length years × anchors, row-major).
 */
export function relativeAnchorWeights(
  releaseBaselineYear: number,
  anchorYears: number[],
  outlookBaselineYear: number,
  years: number[],
): Float64Array[] {
  const atBaseline = anchorWeights(releaseBaselineYear, anchorYears, outlookBaselineYear)
  return years.map((year) => {
    const weights = anchorWeights(releaseBaselineYear, anchorYears, year)
    for (let a = 0; a < weights.length; a++) weights[a]! -= atBaseline[a]!
    return weights
  })
}
