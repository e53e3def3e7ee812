import type { ObservationsInput } from '../engine/schema'
import { gaugePoints, type GaugeRecord } from './gauge-record'
import { NODAL_PERIOD_YEARS, type GaugeTrendFit } from './gauge-trend'

// A site's gauge record as the outlook engine weighs it (`observations` of an outlook input): the
// unflagged values since the reference epoch, as rise above mean sea level at the epoch (the site's
// datum offset), with the fitted tidal cycles taken out, and the fit's AR(1) residual model.
//
// Decisions, stated in the briefing's method note:
// - The nodal cycle (and for monthly records the seasonal one) is a tide the projections do not hold,
//   so the fitted cycle is subtracted from each value rather than modelled as noise. The datum offset is
//   a mean over the cycle, so nothing is added back at the epoch.
// - The epoch's level is the site's stated datum offset, taken as exact: its own uncertainty is not
//   modelled, so an offset that is wrong by a few centimetres moves every trajectory's weight.
// - The residual model is the fit's (σ and φ about a smooth quadratic), taken as known.

const CYCLE_COLUMNS = 3

/** Each fitted cycle's value at `time`: nodal, then annual and semi-annual for monthly records. */
function cyclesAt(fit: GaugeTrendFit, time: number): number {
  const nodal = (2 * Math.PI * time) / NODAL_PERIOD_YEARS
  const terms = [Math.sin(nodal), Math.cos(nodal)]
  if (fit.resolution === 'monthly') {
    const annual = 2 * Math.PI * time
    terms.push(Math.sin(annual), Math.cos(annual), Math.sin(2 * annual), Math.cos(2 * annual))
  }
  return terms.reduce((sum, term, k) => sum + term * (fit.coefficients[CYCLE_COLUMNS + k] ?? 0), 0)
}

/**
 * The record's values from the epoch to the outlook's last year, ready for the engine; null when the
 * record has no fit (too short to tell the nodal cycle from a trend) or no value in that span.
 */
export function observationsForOutlook(
  record: GaugeRecord,
  fit: GaugeTrendFit | null,
  datumOffset: number,
  epoch: number,
  lastYear: number,
): ObservationsInput | null {
  if (!fit) return null
  const points = gaugePoints(record)
    .filter(point => point.time >= epoch && point.time <= lastYear)
    .sort((a, b) => a.time - b.time)
  if (!points.length) return null
  return {
    times: points.map(point => point.time),
    rise: points.map(point => point.height - datumOffset - cyclesAt(fit, point.time)),
    residualSd: fit.residualSd,
    phi: fit.phi,
    stepYears: record.resolution === 'annual' ? 1 : 1 / 12,
  }
}
