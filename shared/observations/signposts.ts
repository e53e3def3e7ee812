import { blockStreamState } from '../engine/rng'
import type { Trajectories } from '../engine'
import { fillNormalScores } from '../engine/ziggurat'
import type { GaugeTrendFit } from './gauge-trend'
import { MIN_TRACKING_YEARS } from './tracking'

// Signposts (Haasnoot et al. 2018, "Signposts in the sand", on monitoring for adaptive pathways): would
// watching the tide gauge have told us in time to decide on the next measure? For each trajectory of an
// outlook we simulate the gauge a planner would read: the trajectory's annual rise plus observation
// noise, fitted by ordinary least squares from the reference epoch to the signal year s. The signal
// "the fitted rate exceeds x mm/yr by year s" then either fires or not, and the trajectory either tips
// (its rise first exceeds the measure's height in its tipping year) by the outlook's horizon or not:
//   timely   fires, tips, and s ≤ tipping year − lead time of the next measure
//   late     fires and tips, but s is after that decision year
//   missed   tips but never fires
//   needless fires but does not tip by the horizon
//   quiet    neither
// For a flood-level measure a trajectory tips in the first year its annual chance of the water reaching
// the level (Gumbel annual maxima with the site's statistics, shifted by the trajectory's rise, as the
// engine's annual flood chances) passes the chosen tolerance. That chance grows with the rise, so it is
// the first year the rise exceeds one height (`floodTippingHeight`); the signal is the same gauge rate.
// Over thresholds x this is the trade-off a planner chooses on: a lower x misses less and fires more
// often for nothing. Rates are fractions of all trajectories.
//
// Assumptions, stated with the result: noise is AR(1) with the site's fitted residual sd and φ (annual
// records), or white with DEFAULT_NOISE_SD_M; the gauge is read from the epoch only (an earlier record
// is not combined); the fit is a straight line (no nodal or seasonal terms, which the simulated noise
// does not contain); the gauge sees the same relative rise as the outlook (land motion included).

/** Sd of annual mean sea level about a smooth trend at a typical tide gauge, metres (order of magnitude [practice]). */
export const DEFAULT_NOISE_SD_M = 0.03
/** The shortest record a signal is read from: tracking's own minimum. */
export const MIN_SIGNAL_YEARS = MIN_TRACKING_YEARS
/** The noise stream is drawn from block indices no outlook uses (an outlook has at most ~1,000 blocks). */
const NOISE_BLOCK = 1 << 30

export interface SignpostNoise {
  /** Sd of the annual mean about the rise, metres, and its lag-one autocorrelation (0: white). */
  sd: number
  phi: number
  source: 'gauge-record' | 'default'
}

export interface SignpostDecision {
  /** The measure's height, metres above mean sea level at the epoch (the trajectories' reference). */
  height: number
  /** Lead time of the next measure: its decision is due this many years before the tipping year. */
  leadTimeYears: number
  /**
   * A flood level: the site's Gumbel statistics (metres above mean sea level at the epoch) and the
   * annual chance of reaching the level past which it tips. Absent: a mean-sea-level height.
   */
  flood?: { location: number, scale: number, tolerance: number }
}

/**
 * The rise past which a flood level's annual chance exceeds the tolerance p. With Gumbel annual maxima
 * F(z) = exp(−e^{−(z − μ)/λ}) shifted by a rise r, the chance of reaching h is 1 − F(h − r) (Coles 2001,
 * "An Introduction to Statistical Modeling of Extreme Values", §3.1.3; `annualExceedance` in
 * shared/engine/flood-chance.ts), increasing in r, and 1 − F(h − r) > p ⟺ r > h − μ + λ·ln(−ln(1 − p)).
 */
export function floodTippingHeight(height: number, flood: NonNullable<SignpostDecision['flood']>): number {
  return height - flood.location + flood.scale * Math.log(-Math.log1p(-flood.tolerance))
}

/** The rise a trajectory tips past: the height itself, or a flood level's (see `floodTippingHeight`). */
export function tippingRise(decision: SignpostDecision): number {
  return decision.flood ? floodTippingHeight(decision.height, decision.flood) : decision.height
}

export interface SignpostPoint {
  /** Signal threshold, mm/yr. */
  threshold: number
  fired: number
  timely: number
  late: number
  missed: number
  needless: number
}

export interface SignpostCurve {
  /** Signal year s: the rate is fitted to the gauge from the epoch to s. */
  year: number
  points: SignpostPoint[]
}

export interface Signposts {
  trajectories: number
  epoch: number
  horizon: number
  /** Share of trajectories that tip by the horizon. */
  tipped: number
  noise: SignpostNoise
  curves: SignpostCurve[]
}

/**
 * The noise of annual means from a record's fit. A monthly record's AR(1) is per month: the mean of 12
 * months has variance σ²/144 · Σᵢⱼ φ^|i−j| and consecutive annual means the covariance
 * σ²/144 · Σ_{i<12≤j<24} φ^(j−i), from which the annual sd and lag-one autocorrelation follow.
 */
export function noiseFromFit(fit: Pick<GaugeTrendFit, 'resolution' | 'residualSd' | 'phi'>): SignpostNoise {
  if (fit.resolution === 'annual') return { sd: fit.residualSd, phi: fit.phi, source: 'gauge-record' }
  let within = 0
  let across = 0
  for (let i = 0; i < 12; i++) {
    for (let j = 0; j < 12; j++) within += fit.phi ** Math.abs(i - j)
    for (let j = 12; j < 24; j++) across += fit.phi ** (j - i)
  }
  const variance = (fit.residualSd ** 2 * within) / 144
  return { sd: Math.sqrt(variance), phi: across / within, source: 'gauge-record' }
}

/** Per trajectory, the first year its rise exceeds `height`, or −1 when it does not by the horizon. */
export function trajectoryTipping(trajectories: Trajectories, height: number): Int32Array {
  const { count, yearCount, firstYear, rise } = trajectories
  const out = new Int32Array(count).fill(-1)
  for (let i = 0; i < count; i++) {
    const at = i * yearCount
    for (let y = 0; y < yearCount; y++) {
      if (rise[at + y]! > height) {
        out[i] = firstYear + y
        break
      }
    }
  }
  return out
}

/**
 * Simulated gauge noise, metres, for years epoch … epoch + years − 1: year y of trajectory i at
 * [y·count + i]. Year by year from one stream, so a trajectory's noise in a year does not depend on how
 * many later years are drawn.
 */
export function gaugeNoise(count: number, years: number, noise: SignpostNoise, seed: number): Float64Array {
  const out = new Float64Array(count * years)
  fillNormalScores(blockStreamState(seed, NOISE_BLOCK), out, 0, out.length)
  const innovation = noise.sd * Math.sqrt(1 - noise.phi * noise.phi)
  for (let i = 0; i < count; i++) out[i] = noise.sd * out[i]!
  for (let y = 1; y < years; y++) {
    const at = y * count
    for (let i = 0; i < count; i++) out[at + i] = noise.phi * out[at - count + i]! + innovation * out[at + i]!
  }
  return out
}

/** OLS slope, mm/yr, of rise + noise (`gaugeNoise`'s layout) over years epoch … signal year, per trajectory. */
export function fittedRates(trajectories: Trajectories, noise: Float64Array, signalYear: number): Float64Array {
  const { count, yearCount, firstYear, rise } = trajectories
  const n = signalYear - firstYear + 1
  const mean = (n - 1) / 2
  let sxx = 0
  for (let x = 0; x < n; x++) sxx += (x - mean) ** 2
  const out = new Float64Array(count)
  for (let x = 0; x < n; x++) {
    const weight = (1000 * (x - mean)) / sxx
    const at = x * count
    for (let i = 0; i < count; i++) out[i]! += weight * (rise[i * yearCount + x]! + noise[at + i]!)
  }
  return out
}

/** Tally of one signal (threshold, year) over the trajectories, as fractions. */
export function signpostPoint(
  rates: Float64Array,
  tipping: Int32Array,
  threshold: number,
  signalYear: number,
  leadTimeYears: number,
): SignpostPoint {
  let fired = 0
  let timely = 0
  let late = 0
  let missed = 0
  let needless = 0
  for (let i = 0; i < rates.length; i++) {
    const fires = rates[i]! > threshold
    const tips = tipping[i]! >= 0
    if (fires) fired++
    if (fires && tips) {
      if (signalYear > tipping[i]! - leadTimeYears) late++
      else timely++
    }
    else if (tips) missed++
    else if (fires) needless++
  }
  const n = rates.length
  return { threshold, fired: fired / n, timely: timely / n, late: late / n, missed: missed / n, needless: needless / n }
}

/** Thresholds from the 1st to the 99th percentile of the fitted rates, at a round step, about 30 of them. */
export function thresholdGrid(rates: Float64Array[]): number[] {
  const all = new Float64Array(rates.reduce((n, r) => n + r.length, 0))
  rates.reduce((at, r) => (all.set(r, at), at + r.length), 0)
  all.sort()
  const at = (p: number) => all[Math.min(all.length - 1, Math.floor(p * all.length))]!
  const low = at(0.01)
  const high = at(0.99)
  const step = [0.1, 0.2, 0.25, 0.5, 1, 2, 5, 10].find(s => (high - low) / s <= 30) ?? 20
  const grid: number[] = []
  for (let x = Math.floor(low / step) * step; x <= high + step / 2; x += step) grid.push(Math.round(x * 100) / 100)
  return grid
}

/**
 * The trade-off curves of a decision: per signal year, the tally at each threshold (mm/yr; a grid
 * over the fitted rates unless given). Signal years must lie from epoch + MIN_SIGNAL_YEARS to the horizon.
 */
export function signposts(
  trajectories: Trajectories,
  decision: SignpostDecision,
  signalYears: number[],
  noise: SignpostNoise,
  seed: number,
  thresholds?: number[],
): Signposts {
  const epoch = trajectories.firstYear
  const horizon = epoch + trajectories.yearCount - 1
  for (const year of signalYears) {
    if (!Number.isInteger(year) || year < epoch + MIN_SIGNAL_YEARS || year > horizon)
      throw new RangeError(`A signal year must be a whole year from ${epoch + MIN_SIGNAL_YEARS} to ${horizon}.`)
  }
  const tipping = trajectoryTipping(trajectories, tippingRise(decision))
  const simulated = gaugeNoise(trajectories.count, Math.max(...signalYears) - epoch + 1, noise, seed)
  const rates = signalYears.map(year => fittedRates(trajectories, simulated, year))
  const grid = thresholds ?? thresholdGrid(rates)
  let tipped = 0
  for (const year of tipping) if (year >= 0) tipped++
  return {
    trajectories: trajectories.count,
    epoch,
    horizon,
    tipped: tipped / trajectories.count,
    noise,
    curves: signalYears.map((year, k) => ({
      year,
      points: grid.map(x => signpostPoint(rates[k]!, tipping, x, year, decision.leadTimeYears)),
    })),
  }
}
