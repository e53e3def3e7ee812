import { maxOf, minOf } from './arrays'
import { EngineInputError } from './errors'
import { fitGumbelByLMoments } from './gumbel'

// Annual maxima from a rising sea: a Gumbel whose location moves linearly in time,
// x_t ~ Gumbel(μ₀ + μ₁·(t − epoch), λ), fitted by maximum likelihood (non-stationary extremes, Coles 2001,
// An Introduction to Statistical Modeling of Extreme Values, ch. 6). A stationary fit of such a record
// places the location at the middle of the record and counts the rise as spread, so its scale is too wide.
//
// Parameters are (μ₀, μ₁, ln λ): on ln λ the scale cannot turn negative during the search. With
// z = (x − μ)/λ, e = exp(−z), w = 1 − e and design columns X (1 and t − epoch), the log-likelihood is
// ℓ = −n·ln λ − Σ(z + e), and
//   ∂ℓ/∂βⱼ = Σ w·Xⱼ/λ                   ∂ℓ/∂ln λ = Σ w·z − n
//   ∂²ℓ/∂βⱼ∂βₖ = −Σ e·Xⱼ·Xₖ/λ²          ∂²ℓ/∂βⱼ∂ln λ = −Σ Xⱼ·(e·z + w)/λ     ∂²ℓ/∂(ln λ)² = −Σ (e·z² + w·z)

export interface TrendGumbelFit {
  /** Location at the reference epoch, metres. */
  location: number
  /** Change of the location per year, metres per year. */
  trendPerYear: number
  scale: number
  /** Standard errors from the inverse observed information at the maximum. */
  se: { location: number, trendPerYear: number, scale: number }
  /** 3×3 covariance of (location, trendPerYear, scale). */
  covariance: number[][]
  logLikelihood: number
  sampleSize: number
  firstYear: number
  lastYear: number
}

export interface StationaryGumbelMle {
  location: number
  scale: number
  se: { location: number, scale: number }
  /** 2×2 covariance of (location, scale). */
  covariance: number[][]
  logLikelihood: number
  sampleSize: number
}

export interface FitOptions {
  /** Newton steps allowed before the fit is refused; 100 is far more than a real record needs. */
  maxIterations?: number
}

// The Newton decrement gᵀ(−H)⁻¹g is about twice the log-likelihood still to gain; below 1e-20 every
// parameter is within about 1e-10 standard errors of the maximum.
const DECREMENT_TOLERANCE = 1e-20
// Armijo sufficient-increase fraction and the smallest step tried before the line search gives up.
const ARMIJO = 1e-4
const MIN_STEP = 1e-12
const QUADRATIC_ZONE = 1e-8

interface Problem { values: number[], columns: number[][] }

function logLikelihood({ values, columns }: Problem, theta: readonly number[]): number {
  const k = columns.length
  const lambda = Math.exp(theta[k]!)
  let sum = -values.length * theta[k]!
  for (let i = 0; i < values.length; i++) {
    let mu = 0
    for (let j = 0; j < k; j++) mu += theta[j]! * columns[j]![i]!
    const z = (values[i]! - mu) / lambda
    sum -= z + Math.exp(-z)
  }
  return sum
}

function derivatives(
  { values, columns }: Problem,
  theta: readonly number[],
): { gradient: number[], information: number[][] } {
  const k = columns.length
  const lambda = Math.exp(theta[k]!)
  const gradient = new Array<number>(k + 1).fill(0)
  const information = Array.from({ length: k + 1 }, () => new Array<number>(k + 1).fill(0))
  for (let i = 0; i < values.length; i++) {
    let mu = 0
    for (let j = 0; j < k; j++) mu += theta[j]! * columns[j]![i]!
    const z = (values[i]! - mu) / lambda
    const e = Math.exp(-z)
    const w = 1 - e
    for (let j = 0; j < k; j++) {
      const xj = columns[j]![i]!
      gradient[j]! += (w * xj) / lambda
      for (let l = 0; l <= j; l++) information[j]![l]! += (e * xj * columns[l]![i]!) / (lambda * lambda)
      information[k]![j]! += (xj * (e * z + w)) / lambda
    }
    gradient[k]! += w * z
    information[k]![k]! += e * z * z + w * z
  }
  gradient[k]! -= values.length
  for (let j = 0; j <= k; j++) for (let l = 0; l < j; l++) information[l]![j] = information[j]![l]!
  return { gradient, information }
}

/** Lower Cholesky factor of a symmetric matrix, or null when it is not positive definite. */
function cholesky(a: readonly number[][]): number[][] | null {
  const m = a.length
  const L = Array.from({ length: m }, () => new Array<number>(m).fill(0))
  for (let j = 0; j < m; j++) {
    let d = a[j]![j]!
    for (let l = 0; l < j; l++) d -= L[j]![l]! ** 2
    if (!(d > 0) || !Number.isFinite(d)) return null
    L[j]![j] = Math.sqrt(d)
    for (let i = j + 1; i < m; i++) {
      let s = a[i]![j]!
      for (let l = 0; l < j; l++) s -= L[i]![l]! * L[j]![l]!
      L[i]![j] = s / L[j]![j]!
    }
  }
  return L
}

/** Solves L·Lᵀ·x = b. */
function solve(L: readonly number[][], b: readonly number[]): number[] {
  const m = b.length
  const y = [...b]
  for (let i = 0; i < m; i++) {
    for (let l = 0; l < i; l++) y[i]! -= L[i]![l]! * y[l]!
    y[i]! /= L[i]![i]!
  }
  for (let i = m - 1; i >= 0; i--) {
    for (let l = i + 1; l < m; l++) y[i]! -= L[l]![i]! * y[l]!
    y[i]! /= L[i]![i]!
  }
  return y
}

function shifted(a: readonly number[][], tau: number): number[][] {
  return a.map((row, i) => row.map((v, j) => (i === j ? v + tau : v)))
}

/**
 * Damped Newton ascent. Away from the maximum the surface need not be concave in (β, ln λ); there the
 * information is shifted towards the identity (Levenberg) so that each step still climbs, and a
 * backtracking line search keeps every accepted step an increase.
 */
function maximise(
  problem: Problem,
  start: number[],
  maxIterations: number,
): { theta: number[], logLikelihood: number, covariance: number[][] } {
  let theta = start
  let current = logLikelihood(problem, theta)
  if (!Number.isFinite(current)) throw notSettled('the starting values give no finite likelihood')
  let previousDecrement = Number.POSITIVE_INFINITY
  for (let iteration = 0; iteration < maxIterations; iteration++) {
    const { gradient, information } = derivatives(problem, theta)
    let L = cholesky(information)
    const exact = L !== null
    let tau = 1e-6 * Math.max(1, maxOf(information.map((row, i) => Math.abs(row[i]!))))
    while (!L && Number.isFinite(tau)) {
      L = cholesky(shifted(information, tau))
      tau *= 10
    }
    if (!L) throw notSettled('the curvature of the likelihood could not be used')
    const step = solve(L, gradient)
    const decrement = gradient.reduce((sum, g, j) => sum + g * step[j]!, 0)
    // A decrement that no longer shrinks has hit the rounding of the sums; 1e-14 is still ~1e-7 standard errors.
    const stalled = decrement < 1e-14 && decrement > previousDecrement / 2
    if (exact && (decrement < DECREMENT_TOLERANCE || stalled)) return finish(theta, current, L)
    previousDecrement = decrement
    // Near the maximum the gain of a step is below the rounding of ℓ, so the line search cannot judge it;
    // there the quadratic model is good and the full Newton step is taken.
    if (exact && decrement < QUADRATIC_ZONE) {
      theta = theta.map((v, j) => v + step[j]!)
      current = logLikelihood(problem, theta)
      continue
    }
    let t = 1
    let moved = false
    while (t >= MIN_STEP) {
      const trial = theta.map((v, j) => v + t * step[j]!)
      const value = logLikelihood(problem, trial)
      if (Number.isFinite(value) && value > current && value >= current + ARMIJO * t * decrement) {
        theta = trial
        current = value
        moved = true
        break
      }
      t /= 2
    }
    if (!moved) throw notSettled('no step from the last point raised the likelihood')
  }
  throw notSettled(`no maximum was reached in ${maxIterations} steps`)
}

function finish(
  theta: number[],
  value: number,
  L: number[][],
): { theta: number[], logLikelihood: number, covariance: number[][] } {
  const m = theta.length
  const identity = Array.from({ length: m }, (_, i) => Array.from({ length: m }, (_, j) => (i === j ? 1 : 0)))
  const columns = identity.map(e => solve(L, e))
  // From ln λ to λ: dλ/d ln λ = λ (the gradient is zero at the maximum, so no other term enters).
  const lambda = Math.exp(theta[m - 1]!)
  const factor = theta.map((_, j) => (j === m - 1 ? lambda : 1))
  const covariance = columns.map((col, i) => col.map((v, j) => v * factor[i]! * factor[j]!))
  return { theta, logLikelihood: value, covariance }
}

function notSettled(detail: string): EngineInputError {
  return new EngineInputError([
    {
      path: 'annualMaxima',
      message: `the maximum-likelihood fit did not settle (${detail}); look for a value in another unit, a mistyped year or an outlier`,
    },
  ])
}

function checkMaxima(maxima: ReadonlyArray<{ year: number, value: number }>, fewest: number, what: string): void {
  if (maxima.length < fewest) {
    throw new EngineInputError([
      { path: 'annualMaxima', message: `needs at least ${fewest} annual maxima to fit ${what}, got ${maxima.length}` },
    ])
  }
  const issues = maxima.flatMap((m, i) => [
    ...(Number.isFinite(m.year)
      ? []
      : [{ path: `annualMaxima[${i}].year`, message: `must be a finite year, got ${m.year}` }]),
    ...(Number.isFinite(m.value)
      ? []
      : [{ path: `annualMaxima[${i}].value`, message: `must be a finite level in metres, got ${m.value}` }]),
  ])
  if (issues.length) throw new EngineInputError(issues)
}

/** Maximum-likelihood fit of a Gumbel whose location changes linearly with the year. */
export function fitGumbelWithTrend(
  maxima: ReadonlyArray<{ year: number, value: number }>,
  referenceEpoch: number,
  { maxIterations = 100 }: FitOptions = {},
): TrendGumbelFit {
  checkMaxima(maxima, 3, 'a location, a trend and a scale')
  if (!Number.isFinite(referenceEpoch)) {
    throw new EngineInputError([{ path: 'referenceEpoch', message: `must be a finite year, got ${referenceEpoch}` }])
  }
  const values = maxima.map(m => m.value)
  // Time counted from the epoch, so the fitted intercept and its standard error are those at the epoch.
  const times = maxima.map(m => m.year - referenceEpoch)
  const years = maxima.map(m => m.year)
  const firstYear = minOf(years)
  const lastYear = maxOf(years)
  if (firstYear === lastYear) {
    throw new EngineInputError([
      { path: 'annualMaxima', message: `all maxima are from ${firstYear}; a trend needs maxima from different years` },
    ])
  }
  // Start: least-squares slope, then L-moments of what is left about it (the slope alone is unbiased
  // for a Gumbel with a linear location, since the errors have a constant mean).
  const n = values.length
  const meanT = times.reduce((s, t) => s + t, 0) / n
  const meanX = values.reduce((s, x) => s + x, 0) / n
  let sxy = 0
  let sxx = 0
  for (let i = 0; i < n; i++) {
    sxy += (times[i]! - meanT) * (values[i]! - meanX)
    sxx += (times[i]! - meanT) ** 2
  }
  const slope = sxy / sxx
  const residuals = values.map((x, i) => x - slope * times[i]!)
  const spread = maxOf(residuals) - minOf(residuals)
  const size = Math.max(1, maxOf(values.map(Math.abs)))
  if (!(spread > 1e-9 * size)) {
    throw new EngineInputError([
      {
        path: 'annualMaxima',
        message:
          'the maxima lie on a straight line in time, which leaves no spread to fit a Gumbel scale to; check that these are each year\'s highest level, not a smoothed or fitted series',
      },
    ])
  }
  const start = fitGumbelByLMoments(residuals)
  const problem = { values, columns: [times.map(() => 1), times] }
  const {
    theta,
    logLikelihood: value,
    covariance,
  } = maximise(problem, [start.location, slope, Math.log(start.scale)], maxIterations)
  const scale = Math.exp(theta[2]!)
  if (!(scale > 0) || !Number.isFinite(scale)) throw notSettled(`the scale came out as ${scale}`)
  return {
    location: theta[0]!,
    trendPerYear: theta[1]!,
    scale,
    se: {
      location: Math.sqrt(covariance[0]![0]!),
      trendPerYear: Math.sqrt(covariance[1]![1]!),
      scale: Math.sqrt(covariance[2]![2]!),
    },
    covariance,
    logLikelihood: value,
    sampleSize: n,
    firstYear,
    lastYear,
  }
}

/** Maximum-likelihood fit of a Gumbel with a constant location, for comparison with the trend fit. */
export function fitGumbelStationaryMle(
  values: readonly number[],
  { maxIterations = 100 }: FitOptions = {},
): StationaryGumbelMle {
  checkMaxima(
    values.map((value, i) => ({ year: i, value })),
    2,
    'a location and a scale',
  )
  const start = fitGumbelByLMoments(values)
  const problem = { values: [...values], columns: [values.map(() => 1)] }
  const {
    theta,
    logLikelihood: value,
    covariance,
  } = maximise(problem, [start.location, Math.log(start.scale)], maxIterations)
  return {
    location: theta[0]!,
    scale: Math.exp(theta[1]!),
    se: { location: Math.sqrt(covariance[0]![0]!), scale: Math.sqrt(covariance[1]![1]!) },
    covariance,
    logLikelihood: value,
    sampleSize: values.length,
  }
}
