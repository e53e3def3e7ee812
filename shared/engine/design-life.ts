import type { LifeSpan } from './types'

// The design-life level (Rootzén & Katz 2013, Water Resources Research): the height with a chosen
// chance of at least one exceedance by the annual maxima during a life. For a height h the chance of
// none is mean over samples of exp(−c·e^{S_s}), c = e^{−(h−μ)/λ}, S_s = ln Σ_years e^{rise/λ}.

const MAX_STEPS = 200

/**
 * Solves mean exp(−e^{x+S}) = 1 − chance for x = ln c over the span's histogram of S (cell centres;
 * under- and overflow at the range's edges) and returns h = μ − λx. The mean falls as x grows, from 1
 * to 0, so x lies between ln(−ln(1 − chance)) − max S and the same less min S; Newton steps are kept
 * inside that bracket, falling back to halving it.
 */
export function designLifeLevel(
  span: LifeSpan,
  counts: Uint32Array,
  gumbel: { location: number, scale: number },
  chance: number,
): number {
  const values: number[] = []
  const weights: number[] = []
  let total = 0
  let smallest = Infinity
  let largest = -Infinity
  for (let k = 0; k <= span.bins + 1; k++) {
    const count = counts[span.histogramOffset + k]!
    if (count === 0) continue
    const bin
      = k === 0 ? span.firstBin - 0.5 : k === span.bins + 1 ? span.firstBin + span.bins - 0.5 : span.firstBin + k - 1
    const value = span.origin + bin * span.width
    if (value < smallest) smallest = value
    if (value > largest) largest = value
    values.push(value)
    weights.push(count)
    total += count
  }
  const reduced = Math.log(-Math.log1p(-chance))
  let low = reduced - largest
  let high = reduced - smallest
  if (low === high) return gumbel.location - gumbel.scale * low
  const target = total * (1 - chance)
  let x = (low + high) / 2
  for (let step = 0; step < MAX_STEPS; step++) {
    let excess = -target
    let slope = 0
    for (let k = 0; k < values.length; k++) {
      const rate = Math.exp(x + values[k]!)
      const none = weights[k]! * Math.exp(-rate)
      excess += none
      slope -= rate * none
    }
    if (excess > 0) low = x
    else high = x
    let next = slope < 0 ? x - excess / slope : (low + high) / 2
    if (!(next > low && next < high)) next = (low + high) / 2
    if (Math.abs(next - x) <= 1e-12 * Math.max(1, Math.abs(x)) || high - low <= 1e-12 * Math.max(1, Math.abs(x))) {
      x = next
      break
    }
    x = next
  }
  return gumbel.location - gumbel.scale * x
}

/**
 * With uncertain parameters (one location and scale per trajectory) the chance of none no longer
 * depends on the height through one per-sample number, so it is summed at fixed heights (`grid`,
 * `GumbelUncertainty.lifeGrid`) and the level is found between the two that bracket 1 − chance,
 * interpolating linearly in ln(−ln(mean chance of none)): for one Gumbel that is exactly linear in the
 * height (ln L − (h − μ)/λ plus the rise's term), so only the mixture's curvature between two grid
 * heights is approximated. Outside the grid the nearest end is returned.
 */
export function gridDesignLifeLevel(
  grid: Float64Array,
  sums: Float64Array,
  at: number,
  n: number,
  chance: number,
): number {
  const target = 1 - chance
  const reduced = (none: number) => Math.log(-Math.log(none))
  // The mean chance of none rises with the height.
  if (sums[at]! / n >= target) return grid[0]!
  for (let g = 1; g < grid.length; g++) {
    const upper = sums[at + g]! / n
    if (upper < target) continue
    const lower = sums[at + g - 1]! / n
    const along
      = lower > 0 && upper < 1
        ? (reduced(lower) - reduced(target)) / (reduced(lower) - reduced(upper))
        : (target - lower) / (upper - lower)
    return grid[g - 1]! + (grid[g]! - grid[g - 1]!) * along
  }
  return grid[grid.length - 1]!
}
