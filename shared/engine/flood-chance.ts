import type { LifeSegment } from './sampler-tables'

// Per-sample chances of the total water level (Gumbel annual maxima shifted by the rise), shared by the
// sample loop and the plan: the plan evaluates them along the all-scores-zero trajectory as the sums'
// reference, and a rise without spread must give exactly the same bits there as in the loop.

/**
 * Chance that a year's annual maximum exceeds a level after a rise: 1 − F(level − rise) =
 * 1 − exp(−exp((rise − shift)/λ)), shift = level − μ. In this form a rise far above or below the level
 * saturates at 1 or 0 instead of multiplying an overflow by an underflow.
 */
export function annualExceedance(rise: number, shift: number, inverseScale: number): number {
  return -Math.expm1(-Math.exp((rise - shift) * inverseScale))
}

/** Beyond e^{±FACTORED_RANGE} a level's factor is not used (see `annualFactor`). */
const FACTORED_RANGE = 300

/**
 * The sample loop has growth = e^{(rise − center)/λ} of every sample for the allowance, so the annual
 * chance costs one more transcendental as −expm1(−growth · factor), factor = e^{(center − shift)/λ}.
 * Exact up to rounding while the factor lies within e^{±300}: where growth overflows or underflows, the
 * chance it stands for is 1 or 0 within 10⁻¹⁹⁰ either way. Outside that, 0: use `annualExceedance`.
 */
export function annualFactor(center: number, shift: number, inverseScale: number): number {
  const exponent = (center - shift) * inverseScale
  return Math.abs(exponent) <= FACTORED_RANGE ? Math.exp(exponent) : 0
}

/** The annual chance from a sample's growth and a level's factor (see `annualFactor`). */
export function factoredExceedance(growth: number, factor: number): number {
  return -Math.expm1(-(growth * factor))
}

/** Chance of no exceedance of a level (shift = level − μ) during a life with ln Σ_years e^{rise/λ} = logSum. */
export function lifeNoExceedance(logSum: number, shift: number, inverseScale: number): number {
  return Math.exp(-Math.exp(logSum - shift * inverseScale))
}

/** Σ_{j=1..steps} exp(a + j·d), for a + j·d ≤ 0 on the run, without overflow or cancellation. */
function geometricRun(a: number, d: number, steps: number): number {
  if (d > 0) return Math.exp(a + steps * d) * (Math.expm1(-steps * d) / Math.expm1(-d))
  if (d < 0) return Math.exp(a + d) * (Math.expm1(steps * d) / Math.expm1(d))
  return steps * Math.exp(a)
}

/**
 * ln Σ_years e^{rise/λ} over a life's annual steps, the rise read at knot k from rise[k·stride + i]
 * (a segment from knot −1 starts at the baseline, rise 0) and interpolated linearly between knots. The chance of no
 * exceedance
 * of h in the life is then Π_years F(h − rise) = exp(−e^{−(h−μ)/λ} · e^{logSum}). Terms are scaled by
 * the largest one, so a large rise over a small λ does not overflow.
 */
export function lifeLogSum(
  segments: LifeSegment[],
  rise: Float64Array,
  stride: number,
  i: number,
  inverseScale: number,
): number {
  let peak = -Infinity
  for (let k = 0; k < segments.length; k++) {
    const segment = segments[k]!
    const from = segment.from < 0 ? 0 : rise[segment.from * stride + i]! * inverseScale
    const slope = (rise[segment.to * stride + i]! * inverseScale - from) / segment.span
    // The run is linear, so its largest term is its first or its last.
    const first = from + segment.first * slope
    const last = from + (segment.first + segment.steps - 1) * slope
    if (first > peak) peak = first
    if (last > peak) peak = last
  }
  let total = 0
  for (let k = 0; k < segments.length; k++) {
    const segment = segments[k]!
    const from = segment.from < 0 ? 0 : rise[segment.from * stride + i]! * inverseScale
    const slope = (rise[segment.to * stride + i]! * inverseScale - from) / segment.span
    total += geometricRun(from + (segment.first - 1) * slope - peak, slope, segment.steps)
  }
  return peak + Math.log(total)
}
