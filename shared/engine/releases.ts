import { standardNormalQuantile } from './normal'
import type { ParsedRelease } from './schema'
import { relativeAnchorWeights } from './timeline'
import { COMPONENT_KIND_DRAWS, COMPONENT_KIND_LOGNORMAL, COMPONENT_KIND_PIECEWISE, type ComponentKind } from './types'

// Release forms → tables that turn a score into a component's rise per output year (already scaled
// and relative to the outlook's baseline year).
//
// normal and quantiles are piecewise linear in the score, so each piece is an intercept and a slope per
// year: interpolating the levels in time is the same as interpolating the lines, because every anchor
// year shares the same probability levels. A normal is one piece (μ + σz). Quantile tables are linear
// in probit space between (Φ⁻¹(pₖ), xₖ) and keep the outermost slopes beyond the outer levels, which
// reproduces a normal exactly when the table comes from one.

export interface ComponentTable {
  kind: ComponentKind
  /** Scores at which the piece (or the ranked draw) changes, ascending. */
  breakpoints: number[]
  /** Piecewise: per piece, intercept and slope per year. Draws: per ranked draw, rise per year. */
  rows: Float64Array[]
  slopes: Float64Array[]
  /** Lognormal: per anchor shift, mu, sigma and per-anchor weights per year. */
  lognormal: { shift: number[], mu: number[], sigma: number[], weights: Float64Array[] } | null
  /** The scale factor (already inside `rows`, `slopes`, `anchorIntercept`, `anchorSlope` and `weights`). */
  scale: number
  /**
   * Per output year, weights on the anchors giving x(year) − x(outlook baseline), without the scale:
   * components that share these weights can be summed per anchor before any year is formed.
   */
  relativeWeights: Float64Array[]
  /** Scaled anchor values as lines in the score, at [row·anchors + a]: pieces, or ranked draws (slope 0). */
  anchorIntercept: Float64Array
  anchorSlope: Float64Array
  /** Draws: the upload index of the draw at each rank (a joint land-motion link follows it). */
  drawOrder: Int32Array | null
}

/** Draw indices ascending by value, ties in upload order. */
export function rankedIndices(count: number, valueOf: (index: number) => number): Int32Array {
  return Int32Array.from({ length: count }, (_, i) => i).sort((a, b) => valueOf(a) - valueOf(b) || a - b)
}

/** Φ⁻¹(j/n), j = 1…n−1: the scores at which the rank of n draws steps up. */
export function drawBreakpoints(n: number): number[] {
  const breakpoints: number[] = []
  for (let j = 1; j < n; j++) breakpoints.push(standardNormalQuantile(j / n))
  return breakpoints
}

/**
 * Rank ⌊Φ(z)·n⌋ (clamped to n − 1) of a draw picked by score z: the number of breakpoints in
 * breakpoints[first … last) at or below z, plus `first`, by bisection. Used in the sample loop.
 */
export function drawRank(breakpoints: Float64Array, first: number, last: number, z: number): number {
  let low = first
  let high = last
  while (low < high) {
    const middle = (low + high) >>> 1
    if (breakpoints[middle]! <= z) low = middle + 1
    else high = middle
  }
  return low
}

/** Lines (intercept, slope) in the score per anchor and piece: lines[a][s]. */
function anchorLines(release: ParsedRelease): { breakpoints: number[], lines: Array<Array<[number, number]>> } {
  if (release.form === 'normal') {
    return { breakpoints: [], lines: release.mean.map((mean, a) => [[mean, release.sd[a]!]]) }
  }
  if (release.form !== 'quantiles') throw new Error(`no piecewise lines for form ${release.form}`)
  const scores = release.levels.map(standardNormalQuantile)
  const lines = release.values.map((row) => {
    const pieces: Array<[number, number]> = []
    for (let s = 0; s + 1 < row.length; s++) {
      const slope = (row[s + 1]! - row[s]!) / (scores[s + 1]! - scores[s]!)
      pieces.push([row[s]! - slope * scores[s]!, slope])
    }
    return pieces
  })
  return { breakpoints: scores.slice(1, -1), lines }
}

export function buildComponentTable(
  release: ParsedRelease,
  scale: number,
  outlookBaselineYear: number,
  years: number[],
): ComponentTable {
  const weights = relativeAnchorWeights(release.baselineYear, release.anchorYears, outlookBaselineYear, years)
  const yearCount = years.length
  const anchorCount = release.anchorYears.length

  if (release.form === 'normal' || release.form === 'quantiles') {
    const { breakpoints, lines } = anchorLines(release)
    const pieceCount = lines[0]!.length
    const rows: Float64Array[] = []
    const slopes: Float64Array[] = []
    for (let s = 0; s < pieceCount; s++) {
      const intercept = new Float64Array(yearCount)
      const slope = new Float64Array(yearCount)
      for (let t = 0; t < yearCount; t++) {
        let a0 = 0
        let a1 = 0
        for (let a = 0; a < anchorCount; a++) {
          a0 += weights[t]![a]! * lines[a]![s]![0]
          a1 += weights[t]![a]! * lines[a]![s]![1]
        }
        intercept[t] = scale * a0
        slope[t] = scale * a1
      }
      rows.push(intercept)
      slopes.push(slope)
    }
    const anchorIntercept = new Float64Array(pieceCount * anchorCount)
    const anchorSlope = new Float64Array(pieceCount * anchorCount)
    for (let s = 0; s < pieceCount; s++) {
      for (let a = 0; a < anchorCount; a++) {
        anchorIntercept[s * anchorCount + a] = scale * lines[a]![s]![0]
        anchorSlope[s * anchorCount + a] = scale * lines[a]![s]![1]
      }
    }
    return {
      kind: COMPONENT_KIND_PIECEWISE,
      breakpoints,
      rows,
      slopes,
      lognormal: null,
      scale,
      relativeWeights: weights,
      anchorIntercept,
      anchorSlope,
      drawOrder: null,
    }
  }

  if (release.form === 'lognormal') {
    const scaled = weights.map(row => row.map(w => scale * w))
    return {
      kind: COMPONENT_KIND_LOGNORMAL,
      breakpoints: [],
      rows: [],
      slopes: [],
      lognormal: { shift: release.shift, mu: release.mu, sigma: release.sigma, weights: scaled },
      scale,
      relativeWeights: weights,
      anchorIntercept: new Float64Array(0),
      anchorSlope: new Float64Array(0),
      drawOrder: null,
    }
  }

  // Draws are ranked by their last anchor value (ties keep upload order) and picked at rank ⌊Φ(z)·n⌋,
  // i.e. the number of breakpoints Φ⁻¹(j/n), j = 1…n−1, at or below the score.
  const drawOrder = rankedIndices(release.draws.length, index => release.draws[index]![anchorCount - 1]!)
  const draws = Array.from(drawOrder, index => release.draws[index]!)
  const rows = draws.map((draw) => {
    const rise = new Float64Array(yearCount)
    for (let t = 0; t < yearCount; t++) {
      let sum = 0
      for (let a = 0; a < anchorCount; a++) sum += weights[t]![a]! * draw[a]!
      rise[t] = scale * sum
    }
    return rise
  })
  const n = rows.length
  const breakpoints = drawBreakpoints(n)
  const anchorIntercept = new Float64Array(n * anchorCount)
  draws.forEach((draw, r) => {
    for (let a = 0; a < anchorCount; a++) anchorIntercept[r * anchorCount + a] = scale * draw[a]!
  })
  return {
    kind: COMPONENT_KIND_DRAWS,
    breakpoints,
    rows,
    slopes: [],
    lognormal: null,
    scale,
    relativeWeights: weights,
    anchorIntercept,
    anchorSlope: new Float64Array(n * anchorCount),
    drawOrder,
  }
}

/** Scaled anchor values of one component for score `z` (outside the sample loop). */
export function anchorValuesAt(table: ComponentTable, z: number, anchorCount: number): Float64Array {
  const out = new Float64Array(anchorCount)
  if (table.kind === COMPONENT_KIND_LOGNORMAL) {
    const { shift, mu, sigma } = table.lognormal!
    for (let a = 0; a < anchorCount; a++) out[a] = table.scale * (shift[a]! + Math.exp(mu[a]! + sigma[a]! * z))
    return out
  }
  let row = 0
  while (row < table.breakpoints.length && z >= table.breakpoints[row]!) row++
  for (let a = 0; a < anchorCount; a++) {
    out[a] = table.anchorIntercept[row * anchorCount + a]! + table.anchorSlope[row * anchorCount + a]! * z
  }
  return out
}

/** Rise of one component in every output year for score `z` (outside the sample loop). */
export function componentRiseAt(table: ComponentTable, z: number, yearCount: number): Float64Array {
  const out = new Float64Array(yearCount)
  if (table.kind === COMPONENT_KIND_LOGNORMAL) {
    const { shift, mu, sigma, weights } = table.lognormal!
    for (let a = 0; a < shift.length; a++) {
      const x = shift[a]! + Math.exp(mu[a]! + sigma[a]! * z)
      for (let t = 0; t < yearCount; t++) out[t]! += weights[t]![a]! * x
    }
    return out
  }
  let row = 0
  while (row < table.breakpoints.length && z >= table.breakpoints[row]!) row++
  for (let t = 0; t < yearCount; t++) {
    out[t] = table.kind === COMPONENT_KIND_PIECEWISE
      ? table.rows[row]![t]! + table.slopes[row]![t]! * z
      : table.rows[row]![t]!
  }
  return out
}
