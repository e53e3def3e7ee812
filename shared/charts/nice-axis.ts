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

/** Years: fewer, wider steps (10, 20, 50 years) so four-digit labels never touch on a phone. */
export function niceYearAxis(first: number, last: number): NiceAxis {
  return niceAxis(first, last, 4)
}
