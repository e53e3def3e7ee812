import { fittedChange, type GaugeTrendFit } from './gauge-trend'

// Is the observed sea tracking the projection? The gauge's fitted smooth level (cycles left out) is turned
// into rise since the site's reference epoch and set against the outlook's likely range (17th–83rd
// percentiles) at the record's last time. The answer is a fact with its numbers; pages word it.

/** Fewer years than this since the epoch and the projected range is narrower than a gauge can resolve. */
export const MIN_TRACKING_YEARS = 5

/** One-sided 95 %: the observed value's interval must clear the range by this many standard errors. */
const CLEAR_Z = 1.645

/**
 * `epoch-unobserved`: the record starts after the epoch, so the rise since the epoch rests on the site's
 * stated mean sea level at the epoch (its datum offset), whose uncertainty nobody has given; the comparison
 * then says no side rather than word a number whose ± leaves that out.
 */
export type TrackingStatus = 'below' | 'within' | 'above' | 'unclear' | 'too-soon' | 'epoch-unobserved'

export interface FanYear { year: number, p17: number, p83: number }

export interface Tracking {
  status: TrackingStatus
  /** The time compared: the middle of the record's last interval. */
  time: number
  /** Observed rise since the epoch (fitted), metres, and its standard error. */
  observed: number
  observedSe: number
  /** The projected likely range at that time, metres of rise since the epoch. */
  likelyLow: number
  likelyHigh: number
  /** How the observed rise was referred to the epoch. */
  epochFrom: 'record' | 'datum-offset'
}

function interpolate(fan: readonly FanYear[], epoch: number, time: number): { low: number, high: number } | null {
  const points = [{ year: epoch, p17: 0, p83: 0 }, ...fan.filter(entry => entry.year > epoch)].sort(
    (a, b) => a.year - b.year,
  )
  for (let i = 1; i < points.length; i++) {
    const a = points[i - 1]!
    const b = points[i]!
    if (time >= a.year && time <= b.year) {
      const w = (time - a.year) / (b.year - a.year)
      return { low: a.p17 + w * (b.p17 - a.p17), high: a.p83 + w * (b.p83 - a.p83) }
    }
  }
  return null
}

/**
 * Compares the record's fitted rise since the epoch with the outlook's likely range. When the epoch lies
 * inside the record, the rise is the fitted change from the epoch; otherwise it is the fitted level less
 * the site's mean sea level at the epoch (its datum offset), shown with the fit's ± only and given the
 * status `epoch-unobserved`. Null when the record ends before the epoch or after the outlook's last year.
 */
export function trackAgainstOutlook(
  fit: GaugeTrendFit,
  epoch: number,
  datumOffset: number,
  fan: readonly FanYear[],
): Tracking | null {
  const time = fit.lastTime
  const range = interpolate(fan, epoch, time)
  if (!range || time < epoch) return null
  const insideRecord = epoch >= fit.firstTime && epoch <= fit.lastTime
  let observed: number
  let observedSe: number
  if (insideRecord) {
    ;({ value: observed, se: observedSe } = fittedChange(fit, epoch, time))
  }
  else {
    const level = fittedChange(fit, fit.centreTime, time)
    observed = fit.coefficients[0]! + level.value - datumOffset
    const delta = time - fit.centreTime
    const g = [1, delta, delta * delta]
    let variance = 0
    for (let j = 0; j < 3; j++) for (let k = 0; k < 3; k++) variance += g[j]! * g[k]! * fit.covariance[j]![k]!
    observedSe = Math.sqrt(Math.max(variance, 0))
  }
  const base = {
    time,
    observed,
    observedSe,
    likelyLow: range.low,
    likelyHigh: range.high,
    epochFrom: insideRecord ? ('record' as const) : ('datum-offset' as const),
  }
  if (time - epoch < MIN_TRACKING_YEARS) return { ...base, status: 'too-soon' }
  if (!insideRecord) return { ...base, status: 'epoch-unobserved' }
  if (observed - CLEAR_Z * observedSe > range.high) return { ...base, status: 'above' }
  if (observed + CLEAR_Z * observedSe < range.low) return { ...base, status: 'below' }
  if (observed >= range.low && observed <= range.high) return { ...base, status: 'within' }
  return { ...base, status: 'unclear' }
}
