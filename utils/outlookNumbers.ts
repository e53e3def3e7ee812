import type { OutlookResult, YearOutlook } from '#shared/engine'

// Small readers of the engine's result, shared by the charts and their tables.

/** The value at a percentile level (0.5 = median) in one year. */
export function percentile(year: Pick<YearOutlook, 'percentiles'>, level: number) {
  return year.percentiles.find(p => Math.abs(p.level - level) < 1e-9)?.value ?? Number.NaN
}

/** The years a headline speaks of: 2050 and 2100 where computed, else the last year. */
export function keyYears(result: OutlookResult) {
  const years: number[] = result.years.filter(year => year === 2050 || year === 2100)
  const last = result.years[result.years.length - 1]!
  if (!years.includes(2100) && !years.includes(last)) years.push(last)
  return years
}

/** Years after the baseline: at the baseline the rise is zero by definition, so it says nothing. */
export function laterYears(result: OutlookResult) {
  return result.byYear.filter(y => y.year > result.baselineYear)
}
