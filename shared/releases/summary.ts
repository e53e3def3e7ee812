import { runOutlook, type ParsedRelease } from '../engine'

export interface BandsAtYear { year: number, p5: number, p17: number, p50: number, p83: number, p95: number }

// Enough samples for centimetre-steady bands in a preview, few enough to answer while typing.
export const SUMMARY_SAMPLES = 20_000
const SUMMARY_SEED = 1

/** Years to draw a release over: its baseline, every decade after, and every anchor year. */
export function previewYears(release: ParsedRelease): number[] {
  const last = release.anchorYears[release.anchorYears.length - 1]!
  const years = new Set<number>([release.baselineYear, ...release.anchorYears])
  for (let year = Math.ceil((release.baselineYear + 1) / 10) * 10; year < last; year += 10) years.add(year)
  return [...years].sort((a, b) => a - b)
}

/**
 * Median, likely (17–83 %) and very likely (5–95 %) ranges of one release alone, sampled by the
 * outlook engine itself so the library shows exactly what outlooks will use.
 */
export function releaseBands(release: ParsedRelease, years = release.anchorYears): BandsAtYear[] {
  const result = runOutlook({
    baselineYear: release.baselineYear,
    years,
    samples: SUMMARY_SAMPLES,
    seed: SUMMARY_SEED,
    components: [{ key: 'release', scale: 1, release }],
    heights: [0],
  })
  return result.byYear.map((year) => {
    const at = (level: number) => year.percentiles.find(p => Math.abs(p.level - level) < 1e-9)!.value
    return { year: year.year, p5: at(0.05), p17: at(0.17), p50: at(0.5), p83: at(0.83), p95: at(0.95) }
  })
}
