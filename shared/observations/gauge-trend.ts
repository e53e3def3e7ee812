import { solveSymmetric, invertSymmetric } from './symmetric'

// Trend and acceleration of a tide-gauge record of mean sea level, by generalised least squares.
//
// Model, with Δ = t − centre (the record's mid-point, so the rate is the rate there):
//   h(t) = a + b·Δ + c·Δ² + nodal + [seasonal] + ε(t)
// where nodal = d·sin(2πt/P) + e·cos(2πt/P) with P = 18.613 years, the lunar nodal cycle taken as a
// known period (its amplitude and phase are fitted), the seasonal cycle (annual and semi-annual
// harmonics) is fitted for monthly records only, and the residuals ε follow a first-order
// autoregression AR(1) in steps of one record interval: ε(t) = φ·ε(t − 1) + η, η ~ N(0, σ²), which
// makes neighbouring years' errors alike and so widens the standard errors an ordinary fit would give.
// The rate is b and the acceleration is 2c (the second derivative, the convention of the
// satellite-era global estimates).
//
// Gaps are allowed: across k missing steps the autoregression carries φᵏ, so the exact whitening is
//   w₁ = ε₁,  wᵢ = (εᵢ − φ^kᵢ·εᵢ₋₁) / √(1 − φ^(2kᵢ))   (kᵢ = steps since the previous value)
// which makes the wᵢ independent with the variance s² = σ²/(1 − φ²) (Prais & Winsten 1954, extended to
// uneven steps). The same transform applied to the design columns turns the problem into ordinary least
// squares. φ is chosen by restricted maximum likelihood (REML, Patterson & Thompson 1971), which
// removes most of the downward bias plain maximum likelihood has in φ for records of a few decades:
//   ℓ_R(φ) = −(n − p)/2 · ln(RSS/(n − p)) − ½·Σ ln(1 − φ^(2kᵢ)) − ½·ln det(X̃ᵀX̃)
// The coefficients' covariance is s²·(X̃ᵀX̃)⁻¹ with s² = RSS/(n − p).

/** Lunar nodal cycle, years (18.613 years, the regression of the Moon's nodes) [pub: standard astronomical value]. */
export const NODAL_PERIOD_YEARS = 18.613

/** One nodal cycle: shorter records cannot tell the cycle from a trend. */
export const MIN_GAUGE_RECORD_YEARS = 19

/** φ is searched inside this range: beyond it the series is a random walk, not a trend with noise. */
const PHI_LIMIT = 0.95

export interface GaugePoint {
  /** Decimal year of the value's middle: 1998.5 for an annual mean, 1998 + (month − 0.5)/12 for a monthly one. */
  time: number
  /** Mean sea level, metres above the site's datum. */
  height: number
}

export type GaugeResolution = 'annual' | 'monthly'

export interface GaugeTrendFit {
  resolution: GaugeResolution
  sampleSize: number
  firstTime: number
  lastTime: number
  /** The rate is the rate at this time (the middle of the record). */
  centreTime: number
  /** Metres per year at the centre, and its standard error. */
  rate: number
  rateSe: number
  /** Metres per year², the second derivative of the fitted curve, and its standard error. */
  acceleration: number
  accelerationSe: number
  /** Half the peak-to-trough range of the fitted nodal cycle, metres. */
  nodalAmplitude: number
  /** Lag-one autocorrelation of the residuals, per record interval. */
  phi: number
  /** Standard deviation of the residuals (not of the innovations), metres. */
  residualSd: number
  /** Fitted coefficients in column order (level, rate, c, nodal sin, nodal cos, [seasonal…]) and their covariance. */
  coefficients: number[]
  covariance: number[][]
}

export class GaugeFitError extends Error {
  constructor(message: string) {
    super(message)
    this.name = 'GaugeFitError'
  }
}

function designRow(time: number, centre: number, resolution: GaugeResolution): number[] {
  const delta = time - centre
  const nodal = (2 * Math.PI * time) / NODAL_PERIOD_YEARS
  const row = [1, delta, delta * delta, Math.sin(nodal), Math.cos(nodal)]
  if (resolution === 'monthly') {
    const annual = 2 * Math.PI * time
    row.push(Math.sin(annual), Math.cos(annual), Math.sin(2 * annual), Math.cos(2 * annual))
  }
  return row
}

interface Whitened { rss: number, logJacobian: number, logDetXtX: number, beta: number[], xtx: number[][] }

/** Least squares after the AR(1) whitening for one φ. */
function fitForPhi(rows: number[][], heights: number[], steps: number[], phi: number): Whitened {
  const p = rows[0]!.length
  const xtx = Array.from({ length: p }, () => new Array<number>(p).fill(0))
  const xty = new Array<number>(p).fill(0)
  let yty = 0
  let logJacobian = 0
  const wx = new Array<number>(p)
  for (let i = 0; i < rows.length; i++) {
    let weight = 0
    let scale = 1
    if (i > 0) {
      weight = phi ** steps[i]!
      scale = 1 / Math.sqrt(1 - weight * weight)
      logJacobian += Math.log(1 - weight * weight)
    }
    const row = rows[i]!
    const previous = rows[i - 1]
    for (let j = 0; j < p; j++) wx[j] = (row[j]! - (previous ? weight * previous[j]! : 0)) * scale
    const wy = (heights[i]! - (i > 0 ? weight * heights[i - 1]! : 0)) * scale
    for (let j = 0; j < p; j++) {
      xty[j]! += wx[j]! * wy
      for (let k = 0; k <= j; k++) xtx[j]![k]! += wx[j]! * wx[k]!
    }
    yty += wy * wy
  }
  for (let j = 0; j < p; j++) for (let k = j + 1; k < p; k++) xtx[j]![k] = xtx[k]![j]!
  const { solution, logDet } = solveSymmetric(xtx, xty)
  let explained = 0
  for (let j = 0; j < p; j++) explained += solution[j]! * xty[j]!
  return { rss: Math.max(yty - explained, 0), logJacobian, logDetXtX: logDet, beta: solution, xtx }
}

function restrictedLogLikelihood(fit: Whitened, n: number, p: number): number {
  return -((n - p) / 2) * Math.log(fit.rss / (n - p)) - fit.logJacobian / 2 - fit.logDetXtX / 2
}

/** Golden-section search for the maximum of a unimodal-enough function on [low, high], after a coarse grid. */
function maximise(f: (x: number) => number, low: number, high: number): number {
  const gridSteps = 38
  let best = low
  let bestValue = -Infinity
  for (let i = 0; i <= gridSteps; i++) {
    const x = low + ((high - low) * i) / gridSteps
    const value = f(x)
    if (value > bestValue) { bestValue = value; best = x }
  }
  const width = (high - low) / gridSteps
  let a = Math.max(low, best - width)
  let b = Math.min(high, best + width)
  const ratio = (Math.sqrt(5) - 1) / 2
  let c = b - ratio * (b - a)
  let d = a + ratio * (b - a)
  let fc = f(c)
  let fd = f(d)
  while (b - a > 1e-6) {
    if (fc > fd) { b = d; d = c; fd = fc; c = b - ratio * (b - a); fc = f(c) }
    else { a = c; c = d; fc = fd; d = a + ratio * (b - a); fd = f(d) }
  }
  return (a + b) / 2
}

/**
 * Fits the rate, acceleration, nodal cycle (and for monthly records the seasonal cycle) of a gauge record
 * with AR(1) residuals. Points need not be sorted; they must be on the record's grid (whole years for
 * annual, whole months for monthly) with no time twice.
 */
export function fitGaugeTrend(points: readonly GaugePoint[], resolution: GaugeResolution): GaugeTrendFit {
  const sorted = [...points].sort((a, b) => a.time - b.time)
  const interval = resolution === 'annual' ? 1 : 1 / 12
  const n = sorted.length
  const span = n ? sorted[n - 1]!.time - sorted[0]!.time + interval : 0
  if (span < MIN_GAUGE_RECORD_YEARS) {
    throw new GaugeFitError(
      `The record spans ${span.toFixed(1)} years; at least ${MIN_GAUGE_RECORD_YEARS} are needed to tell the 18.6-year nodal cycle from a trend.`,
    )
  }
  const firstTime = sorted[0]!.time
  const lastTime = sorted[n - 1]!.time
  const centre = (firstTime + lastTime) / 2
  const rows = sorted.map(point => designRow(point.time, centre, resolution))
  const heights = sorted.map(point => point.height)
  const steps = sorted.map((point, i) => (i === 0 ? 0 : Math.round((point.time - sorted[i - 1]!.time) / interval)))
  const p = rows[0]!.length
  if (n < p + 10) {
    throw new GaugeFitError(
      `The record has ${n} values; at least ${p + 10} are needed for a trend, an acceleration and the cycles.`,
    )
  }
  if (steps.some((step, i) => i > 0 && step < 1))
    throw new GaugeFitError('Two values share one time; give one value per interval.')

  const phi = maximise(
    value => restrictedLogLikelihood(fitForPhi(rows, heights, steps, value), n, p),
    -PHI_LIMIT,
    PHI_LIMIT,
  )
  const fit = fitForPhi(rows, heights, steps, phi)
  const variance = fit.rss / (n - p)
  const covariance = invertSymmetric(fit.xtx).map(row => row.map(value => value * variance))
  const [, b, c, d, e] = fit.beta as [number, number, number, number, number]
  return {
    resolution,
    sampleSize: n,
    firstTime,
    lastTime,
    centreTime: centre,
    rate: b,
    rateSe: Math.sqrt(covariance[1]![1]!),
    acceleration: 2 * c,
    accelerationSe: 2 * Math.sqrt(covariance[2]![2]!),
    nodalAmplitude: Math.hypot(d, e),
    phi,
    residualSd: Math.sqrt(variance),
    coefficients: fit.beta,
    covariance,
  }
}

/**
 * The fitted smooth level change between two times (the nodal and seasonal cycles left out: they are
 * tides, not a change of the sea), with its standard error from the coefficients' covariance.
 */
export function fittedChange(fit: GaugeTrendFit, from: number, to: number): { value: number, se: number } {
  const d0 = from - fit.centreTime
  const d1 = to - fit.centreTime
  const gRate = d1 - d0
  const gCurve = d1 * d1 - d0 * d0
  const [, b, c] = fit.coefficients as [number, number, number]
  const cov = fit.covariance
  const variance = gRate * gRate * cov[1]![1]! + 2 * gRate * gCurve * cov[1]![2]! + gCurve * gCurve * cov[2]![2]!
  return { value: b * gRate + c * gCurve, se: Math.sqrt(Math.max(variance, 0)) }
}
