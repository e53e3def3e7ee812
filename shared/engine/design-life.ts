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
  gumbel: { location: number; scale: number },
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
    const bin = k === 0 ? span.firstBin - 0.5 : k === span.bins + 1 ? span.firstBin + span.bins - 0.5 : span.firstBin + k - 1
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
