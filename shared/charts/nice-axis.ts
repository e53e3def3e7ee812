// Axis bounds on round numbers: the step is 1, 2 or 5 times a power of ten (the one nearest the
// wanted step, in ratio) and both ends are whole steps, so an axis reads 0.2 … 1.4, never 0.1 … 1.3
// or 2005 … 2150. Used by the outlook charts on the page and by the briefing's charts (page and PDF).

export interface NiceAxis { min: number, max: number, interval: number }

/** Round ends and a step that give about `ticks` intervals over [low, high]. */
export function niceAxis(low: number, high: number, ticks = 5): NiceAxis {
  if (!Number.isFinite(low) || !Number.isFinite(high)) return { min: 0, max: 1, interval: 0.2 }
  if (high <= low) high = low + (Math.abs(low) || 1) * 0.1
  const raw = (high - low) / ticks
  const power = 10 ** Math.floor(Math.log10(raw))
  const interval = [1, 2, 5, 10]
    .map(m => m * power)
    .reduce((best, step) => (Math.abs(Math.log(step / raw)) < Math.abs(Math.log(best / raw)) ? step : best))
  // Steps like 0.1 carry binary noise (0.30000000000000004): round to the step's own decimals.
  const decimals = Math.max(0, -Math.floor(Math.log10(interval)) + 1)
  const clean = (value: number) => Number(value.toFixed(decimals)) + 0
  return {
    min: clean(Math.floor(low / interval + 1e-9) * interval),
    max: clean(Math.ceil(high / interval - 1e-9) * interval),
    interval,
  }
}

export interface YearAxis extends NiceAxis {
  /** Labels stand on whole multiples of this step (10, 20, 50 or 100 years), plus the first year. */
  labelStep: number
}

/**
 * Years: the axis starts and ends on the decade of the first and last year (an outlook from 2020 starts
 * at 2020, not at 2000), with a tick every 10 years or so; labels stand on wider round steps (2050,
 * 2100, 2150) so four-digit labels never touch on a phone. ECharts places ticks at min + k·interval, so
 * round labels need a tick step that divides both the start and the label step.
 */
export function niceYearAxis(first: number, last: number): YearAxis {
  const labelStep = niceAxis(first, last, 4).interval
  const tick = labelStep >= 50 ? labelStep / 5 : labelStep >= 20 ? labelStep / 2 : labelStep
  return {
    min: Math.floor(first / tick + 1e-9) * tick,
    max: Math.ceil(last / tick - 1e-9) * tick,
    interval: tick,
    labelStep,
  }
}

/**
 * The label of a year on such an axis: both ends, and each whole label step at least 0.6 of a step from
 * either end (so 2020 and 2050 both show, but 2140 never crowds 2150); '' elsewhere.
 */
export function yearAxisLabel(axis: YearAxis) {
  const clear = 0.6 * axis.labelStep
  return (year: number) =>
    year === axis.min
    || year === axis.max
    || (year % axis.labelStep === 0 && year - axis.min >= clear && axis.max - year >= clear)
      ? String(year)
      : ''
}
