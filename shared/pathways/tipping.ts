// Tipping years: the first calendar year in which the chance of exceeding a measure's height reaches
// a tolerance, at annual resolution. A mean-sea-level height's chance is counted from the trajectories
// (the engine's trigger counts, shared/engine/tile-triggers.ts); a flood level's is the mean over the
// trajectories of that year's Gumbel exceedance (the engine's annual flood chances, same file).

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
  /** Counted year by year from the trajectories. */
  resolution: 'annual'
}

/** A chance in each calendar year from firstYear, with its Monte Carlo standard error. */
export interface AnnualChances {
  firstYear: number
  value: number[]
  se: number[]
}

/** The tipping year at a tolerance from a chance known for every year. */
export function tippingFromChances(chances: AnnualChances, tolerance: number): TippingYear {
  let year: number | null = null
  let earliest: number | null = null
  let latest: number | null = null
  for (let y = 0; y < chances.value.length; y++) {
    const p = chances.value[y]!
    const se = chances.se[y]!
    if (earliest === null && p + INTERVAL_Z * se >= tolerance) earliest = chances.firstYear + y
    if (year === null && p >= tolerance) year = chances.firstYear + y
    if (latest === null && p - INTERVAL_Z * se >= tolerance) {
      latest = chances.firstYear + y
      break
    }
  }
  return { tolerance, year, earliest, latest, resolution: 'annual' }
}

/** Chances from per-year exceedance counts over n trajectories (year index 0 = firstYear), binomial SEs. */
export function chancesFromCounts(counts: ArrayLike<number>, firstYear: number, n: number): AnnualChances {
  const value = Array.from(counts, count => count / n)
  return { firstYear, value, se: value.map(p => Math.sqrt((p * (1 - p)) / n)) }
}

/** From per-year exceedance counts over n trajectories, year index 0 = firstYear. */
export function tippingFromCounts(
  counts: ArrayLike<number>,
  firstYear: number,
  n: number,
  tolerance: number,
): TippingYear {
  return tippingFromChances(chancesFromCounts(counts, firstYear, n), tolerance)
}
