import { meanLandRate } from '../engine/land-motion'
import { buildComponentTable, componentRiseAt } from '../engine/releases'
import { releaseSchema, type OutlookInput } from '../engine/schema'

// A storyline at a site: what the rise would be if the storyline happened. It is a what-if, not a
// sample: components the storyline names take its values, the others their middle estimate (score 0
// of the outlook's own release), each times the site's scale factor, plus the site's mean land motion.
// Nothing here touches the Monte Carlo, so the chances stay those of the releases alone.

export interface StorylineValues {
  name: string
  baselineYear: number
  anchorYears: number[]
  values: Record<string, number[]>
}

export interface StorylineRise {
  year: number
  /** Metres above mean sea level at the outlook's baseline year. */
  rise: number
}

/** Linear in time from zero at the baseline year through the anchor values; null past the last anchor. */
export function valueAt(baselineYear: number, anchorYears: number[], values: number[], year: number): number | null {
  if (year <= baselineYear) return 0
  let previousYear = baselineYear
  let previous = 0
  for (let a = 0; a < anchorYears.length; a++) {
    const anchor = anchorYears[a]!
    if (year <= anchor) return previous + (values[a]! - previous) * (year - previousYear) / (anchor - previousYear)
    previousYear = anchor
    previous = values[a]!
  }
  return null
}

/**
 * What a storyline needs of an outlook: per component its scale and its middle estimate (score 0 of the
 * outlook's release, scaled, relative to the baseline year) in each output year, and the land motion.
 * Small, so a kept outlook can hold it instead of its releases.
 */
export interface StorylineBasis {
  baselineYear: number
  years: number[]
  landRateMmPerYear: number
  components: { key: string, scale: number, middle: number[] }[]
}

export function storylineBasis(
  input: Pick<OutlookInput, 'baselineYear' | 'years' | 'components' | 'landMotion'>,
): StorylineBasis {
  const years = [...input.years]
  return {
    baselineYear: input.baselineYear,
    years,
    landRateMmPerYear: meanLandRate(input.landMotion),
    components: input.components.map((c) => {
      const scale = c.scale ?? 1
      const table = buildComponentTable(releaseSchema.parse(c.release), scale, input.baselineYear, years)
      return { key: c.key, scale, middle: Array.from(componentRiseAt(table, 0, years.length)) }
    }),
  }
}

/**
 * The storyline's rise at the outlook's site in each output year up to its last anchor year, metres
 * above mean sea level at the outlook's baseline year (as the engine counts rise): the components it
 * names at its values times the site's scale factor, the others at their middle estimate, less the
 * site's mean land motion.
 */
export function storylineRise(storyline: StorylineValues, basis: StorylineBasis): StorylineRise[] {
  const base = basis.baselineYear
  return basis.years.flatMap((year, t) => {
    if (year === base) return []
    let rise = -(basis.landRateMmPerYear / 1000) * (year - base)
    for (const c of basis.components) {
      const own = storyline.values[c.key]
      if (!own) {
        rise += c.middle[t]!
        continue
      }
      const now = valueAt(storyline.baselineYear, storyline.anchorYears, own, year)
      if (now === null) return []
      rise += c.scale * (now - valueAt(storyline.baselineYear, storyline.anchorYears, own, base)!)
    }
    return [{ year, rise }]
  })
}
