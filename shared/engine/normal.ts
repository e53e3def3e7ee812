// Standard normal quantile function Φ⁻¹ by Wichura's algorithm AS 241 (PPND16), Applied Statistics
// 37(3):477–484, 1988: rational approximations with relative error about 1e-16 over (0, 1). The engine
// turns each uniform into a score with it, so a score's quantile level is exact to double precision,
// which is what the quantile-table and sample-draw release forms need; the central branch (85 % of calls)
// needs no logarithm.

const SPLIT_CENTRAL = 0.425
const SPLIT_TAIL = 5
const CENTRAL_R = 0.180625

/** Central branch, |p − 0.5| ≤ 0.425, given q = p − 0.5: a rational function, no logarithm. */
function centralQuantile(q: number): number {
  const r = CENTRAL_R - q * q
  return (
    (q *
      (((((((2509.0809287301226727 * r + 33430.575583588128105) * r + 67265.770927008700853) * r +
        45921.953931549871457) * r + 13731.693765509461125) * r + 1971.5909503065514427) * r +
        133.14166789178437745) * r + 3.387132872796366608)) /
    (((((((5226.495278852545925 * r + 28729.085735721942674) * r + 39307.89580009271061) * r +
      21213.794301586595867) * r + 5394.1960214247511077) * r + 687.1870074920579083) * r +
      42.313330701600911252) * r + 1)
  )
}

/** Tail branches, for |p − 0.5| > 0.425 and p strictly inside (0, 1). */
function tailQuantile(p: number): number {
  const q = p - 0.5
  let r = Math.sqrt(-Math.log(q < 0 ? p : 1 - p))
  let value: number
  if (r <= SPLIT_TAIL) {
    r -= 1.6
    value =
      (((((((7.7454501427834140764e-4 * r + 0.0227238449892691845833) * r + 0.24178072517745061177) * r +
        1.27045825245236838258) * r + 3.64784832476320460504) * r + 5.7694972214606914055) * r +
        4.6303378461565452959) * r + 1.42343711074968357734) /
      (((((((1.05075007164441684324e-9 * r + 5.475938084995344946e-4) * r + 0.0151986665636164571966) * r +
        0.14810397642748007459) * r + 0.68976733498510000455) * r + 1.6763848301838038494) * r +
        2.05319162663775882187) * r + 1)
  } else {
    r -= SPLIT_TAIL
    value =
      (((((((2.01033439929228813265e-7 * r + 2.71155556874348757815e-5) * r + 0.0012426609473880784386) * r +
        0.026532189526576123093) * r + 0.29656057182850489123) * r + 1.7848265399172913358) * r +
        5.4637849111641143699) * r + 6.6579046435011037772) /
      (((((((2.04426310338993978564e-15 * r + 1.4215117583164458887e-7) * r + 1.8463183175100546818e-5) * r +
        7.868691311456132591e-4) * r + 0.0148753612908506148525) * r + 0.13692988092273580531) * r +
        0.59983220655588793769) * r + 1)
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
 * Φ⁻¹ of the first `count` values of `levels` (all strictly inside (0, 1)) into `out`, bit for bit the
 * same as `standardNormalQuantile`. Two passes keep the common case free of unpredictable branches: every
 * value goes through the central rational function while tail positions are listed without a branch,
 * then the ~15 % in the tails are recomputed. `tails` needs room for `count` indices.
 */
export function standardNormalQuantiles(levels: Float64Array, out: Float64Array, count: number, tails: Int32Array): void {
  let tailCount = 0
  for (let i = 0; i < count; i++) {
    const q = levels[i]! - 0.5
    tails[tailCount] = i
    tailCount += +(Math.abs(q) > SPLIT_CENTRAL)
    out[i] = centralQuantile(q)
  }
  for (let k = 0; k < tailCount; k++) {
    const i = tails[k]!
    out[i] = tailQuantile(levels[i]!)
  }
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
  return 0.5 + sum * Math.exp(-0.5 * xx - 0.91893853320467274178)
}
