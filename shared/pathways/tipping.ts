// Tipping years: the first calendar year in which the chance of exceeding a measure's height reaches
// a tolerance. A mean-sea-level height is counted from the trajectories at annual resolution (the
// engine's trigger counts, shared/engine/tile-triggers.ts); a flood level's annual chance is known at
// output years only and is interpolated between them.

/**
 * Two-sided 95 % normal score: the Monte Carlo interval of a tipping year is where the chance is within ±1.96 SE of the
 * tolerance.
 */
export const INTERVAL_Z = 1.959963984540054

export interface TippingYear {
  tolerance: number
  /** First year whose chance reaches the tolerance; null when none does by the horizon. */
  year: number | null
  /**
   * Monte Carlo interval of that year: the first year whose chance plus 1.96 SE reaches the tolerance
   * (earliest) and the first whose chance minus 1.96 SE does (latest; null past the horizon). It
   * reflects the finite number of trajectories only, not the spread of the science.
   */
  earliest: number | null
  latest: number | null
  /** 'annual' when counted year by year from the trajectories; 'interpolated' between output years. */
  resolution: 'annual' | 'interpolated'
}

/** From per-year exceedance counts over n trajectories, year index 0 = firstYear. */
export function tippingFromCounts(
  counts: ArrayLike<number>,
  firstYear: number,
  n: number,
  tolerance: number,
): TippingYear {
  let year: number | null = null
  let earliest: number | null = null
  let latest: number | null = null
  for (let y = 0; y < counts.length; y++) {
    const p = counts[y]! / n
    const se = Math.sqrt((p * (1 - p)) / n)
    if (earliest === null && p + INTERVAL_Z * se >= tolerance) earliest = firstYear + y
    if (year === null && p >= tolerance) year = firstYear + y
    if (latest === null && p - INTERVAL_Z * se >= tolerance) {
      latest = firstYear + y
      break
    }
  }
  return { tolerance, year, earliest, latest, resolution: 'annual' }
}

/**
 * From chances known at output years (a flood level's annual chance): the crossing year between the
 * two output years that bracket the tolerance, rounded up to a whole year, linear in the chance.
 */
export function tippingFromOutputYears(
  years: number[],
  chances: Array<{ value: number, se: number }>,
  tolerance: number,
): TippingYear {
  const crossing = (value: (i: number) => number) => {
    for (let i = 0; i < years.length; i++) {
      const v = value(i)
      if (v < tolerance) continue
      if (i === 0) return years[0]!
      const before = value(i - 1)
      const fraction = (tolerance - before) / (v - before)
      return Math.ceil(years[i - 1]! + fraction * (years[i]! - years[i - 1]!) - 1e-9)
    }
    return null
  }
  return {
    tolerance,
    year: crossing(i => chances[i]!.value),
    earliest: crossing(i => chances[i]!.value + INTERVAL_Z * chances[i]!.se),
    latest: crossing(i => chances[i]!.value - INTERVAL_Z * chances[i]!.se),
    resolution: 'interpolated',
  }
}
