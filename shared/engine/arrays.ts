// Helpers for arrays whose length the user decides (draws, maxima, issues). Spreading such an array
// into a call (`Math.max(...values)`, `push(...values)`) passes every element as an argument, and
// V8 throws a RangeError somewhere past ~100,000 of them: a release of 70,000 draws × 2 anchors did.

/** The smallest value (Infinity for none), without spreading. */
export function minOf(values: ArrayLike<number>): number {
  let min = Number.POSITIVE_INFINITY
  for (let i = 0; i < values.length; i++) if (values[i]! < min) min = values[i]!
  return min
}

/** The largest value (-Infinity for none), without spreading. */
export function maxOf(values: ArrayLike<number>): number {
  let max = Number.NEGATIVE_INFINITY
  for (let i = 0; i < values.length; i++) if (values[i]! > max) max = values[i]!
  return max
}

/** `target.push(...source)` for any length. */
export function appendAll<T>(target: T[], source: ArrayLike<T>): T[] {
  for (let i = 0; i < source.length; i++) target.push(source[i]!)
  return target
}
