// Standard normal quantile function Φ⁻¹ by Wichura's algorithm AS 241 (PPND16), Applied Statistics
// 37(3):477–484, 1988: rational approximations with relative error about 1e-16 over (0, 1). The engine
// places the breakpoints of quantile tables and uploaded draws with it (scores themselves come from the
// ziggurat, `ziggurat.ts`). Coefficients are the published ones rounded to the 17 significant digits a
// double holds: the same numbers.

const SPLIT_CENTRAL = 0.425
const SPLIT_TAIL = 5
const CENTRAL_R = 0.180625

/** Central branch, |p − 0.5| ≤ 0.425, given q = p − 0.5: a rational function, no logarithm. */
function centralQuantile(q: number): number {
  const r = CENTRAL_R - q * q
  return (
    (q
      * (((((((2509.0809287301227 * r + 33430.57558358813) * r + 67265.7709270087) * r
        + 45921.95393154987) * r + 13731.69376550946) * r + 1971.5909503065513) * r
        + 133.14166789178438) * r + 3.3871328727963665))
      / (((((((5226.495278852546 * r + 28729.085735721943) * r + 39307.89580009271) * r
        + 21213.794301586597) * r + 5394.196021424751) * r + 687.1870074920579) * r
        + 42.31333070160091) * r + 1)
  )
}

/** Tail branches, for |p − 0.5| > 0.425 and p strictly inside (0, 1). */
function tailQuantile(p: number): number {
  const q = p - 0.5
  let r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p))
  let value: number
  if (r <= SPLIT_TAIL) {
    r -= 1.6
    value
      = (((((((0.0007745450142783414 * r + 0.022723844989269184) * r + 0.2417807251774506) * r
        + 1.2704582524523684) * r + 3.6478483247632045) * r + 5.769497221460691) * r
        + 4.630337846156546) * r + 1.4234371107496835)
      / (((((((1.0507500716444169e-9 * r + 0.0005475938084995345) * r + 0.015198666563616457) * r
        + 0.14810397642748008) * r + 0.6897673349851) * r + 1.6763848301838038) * r
        + 2.053191626637759) * r + 1)
  }
  else {
    r -= SPLIT_TAIL
    value
      = (((((((2.0103343992922881e-7 * r + 2.7115555687434876e-5) * r + 0.0012426609473880784) * r
        + 0.026532189526576124) * r + 0.29656057182850487) * r + 1.7848265399172913) * r
        + 5.463784911164114) * r + 6.657904643501103)
      / (((((((2.0442631033899397e-15 * r + 1.421511758316446e-7) * r + 1.8463183175100548e-5) * r
        + 0.0007868691311456133) * r + 0.014875361290850615) * r + 0.1369298809227358) * r
        + 0.599832206555888) * r + 1)
  }
  return q < 0 ? -value : value
}

/** Φ⁻¹(p). Returns -Infinity at 0, +Infinity at 1 and NaN outside [0, 1]. */
export function standardNormalQuantile(p: number): number {
  const q = p - 0.5
  if (Math.abs(q) <= SPLIT_CENTRAL) return centralQuantile(q)
  if (!(p > 0 && p < 1)) {
    if (p === 0) return -Infinity
    if (p === 1) return Infinity
    return NaN
  }
  return tailQuantile(p)
}

/**
 * Φ(x) by Marsaglia's series ("Evaluating the normal distribution", J. Stat. Software 11(4), 2004),
 * absolute error about 1e-15. Used outside the sample loop (quantile levels, checks), so speed is
 * secondary to having no dependency.
 */
export function standardNormalCdf(x: number): number {
  if (Number.isNaN(x)) return NaN
  if (x < -8.3) return 0
  if (x > 8.3) return 1
  let sum = x
  let term = x
  let previous = 0
  const xx = x * x
  for (let i = 3; sum !== previous; i += 2) {
    previous = sum
    term *= xx / i
    sum += term
  }
  return 0.5 + sum * Math.exp(-0.5 * xx - 0.9189385332046728)
}
