import { EngineInputError } from '../engine/errors'
import { fitGumbelWithTrend, type TrendGumbelFit } from '../engine/gumbel-trend'
import { uploadIssue as issue } from '../wording/uploads'
import { CsvError, parseNumberGrid, type CsvIssue } from './csv'

/**
 * Fewest years of annual maxima accepted. A location, a trend and a scale from fewer than about 20 annual
 * maxima are too uncertain to plan with; extreme-value guidance commonly asks for at least 20–30 years
 * [practice].
 */
export const MIN_ANNUAL_MAXIMA_YEARS = 20

/**
 * Plausible annual maxima, metres above the site's datum. Tides and surges on Earth stay well inside
 * this, so a value outside is in another unit or mistyped.
 */
export const ANNUAL_MAXIMUM_BOUNDS = { min: -20, max: 20 } as const

/** How far the reference epoch may lie outside the record: a trend carried further is not a fit. */
export const MAX_EPOCH_DISTANCE_YEARS = 100

const FIRST_YEAR = 1800
const LAST_YEAR = 2200
const MAX_ROW_ISSUES = 10

export interface AnnualMaximaFit { maxima: { year: number, value: number }[], fit: TrendGumbelFit, sampleSize: number }

/**
 * What to do about values outside the bounds, judged from the typical size of all values: one value
 * far off among metres is a typing error, most of them far off is a unit. From 2 m to 20 m, centimetres
 * and millimetres of ordinary levels overlap, so both are named.
 */
function unitAdvice(values: number[]): string {
  const sizes = values.map(Math.abs).sort((a, b) => a - b)
  const typical = sizes[Math.floor(sizes.length / 2)]!
  if (typical > 2000) return 'millimetres'
  if (typical > 200) return 'centimetresOrMillimetres'
  if (typical > 20) return 'centimetres'
  return 'checkMaximum'
}

function rowIssues(rows: number[][]): CsvIssue[] {
  const issues: CsvIssue[] = []
  const seen = new Set<number>()
  const { min, max } = ANNUAL_MAXIMUM_BOUNDS
  const advice = unitAdvice(rows.map(([, value]) => value!))
  rows.forEach(([year, value], r) => {
    const row = `csv row ${r + 2}`
    if (!Number.isInteger(year) || year! < FIRST_YEAR || year! > LAST_YEAR)
      issues.push(issue(`${row}, column year`, 'notYear', { cell: String(year), first: FIRST_YEAR, last: LAST_YEAR }))
    else if (seen.has(year!)) issues.push(issue(`${row}, column year`, 'maximumTwice', { year: year! }))
    seen.add(year!)
    if (!(value! >= min && value! <= max))
      issues.push(issue(`${row}, column value`, 'outside', { value: String(value), min, max, advice }))
  })
  return issues
}

/**
 * Annual maxima from CSV (`year,value`, one row per year, gaps allowed), fitted by maximum likelihood as a
 * Gumbel whose location rises linearly in time, with the location given at the site's reference epoch.
 */
export function fitAnnualMaximaCsv(text: string, referenceEpoch: number): AnnualMaximaFit {
  const { header, rows } = parseNumberGrid(text)
  if (header.length !== 2 || header[0]!.toLowerCase() !== 'year' || header[1]!.toLowerCase() !== 'value') {
    throw new CsvError([issue('csv header', 'maximaHeader', { header: header.join(',') })])
  }
  const issues = rowIssues(rows).slice(0, MAX_ROW_ISSUES)
  if (rows.length < MIN_ANNUAL_MAXIMA_YEARS) {
    issues.push(issue('csv', 'tooFewYears', { min: MIN_ANNUAL_MAXIMA_YEARS, count: rows.length }))
  }
  if (issues.length) throw new CsvError(issues)

  const maxima = rows.map(([year, value]) => ({ year: year!, value: value! })).sort((a, b) => a.year - b.year)
  const firstYear = maxima[0]!.year
  const lastYear = maxima[maxima.length - 1]!.year
  if (
    !Number.isFinite(referenceEpoch)
    || referenceEpoch < firstYear - MAX_EPOCH_DISTANCE_YEARS
    || referenceEpoch > lastYear + MAX_EPOCH_DISTANCE_YEARS
  ) {
    throw new CsvError([
      issue('reference epoch', 'epochFar', {
        epoch: referenceEpoch,
        years: MAX_EPOCH_DISTANCE_YEARS,
        first: firstYear,
        last: lastYear,
      }),
    ])
  }

  let fit: TrendGumbelFit
  try {
    fit = fitGumbelWithTrend(maxima, referenceEpoch)
  }
  catch (error) {
    if (!(error instanceof EngineInputError)) throw error
    throw new CsvError(error.issues.map(problem => ({ field: 'csv', message: `No Gumbel fit: ${problem.message}.` })))
  }
  if (
    !(fit.scale > 0)
    || !Number.isFinite(fit.scale)
    || !Number.isFinite(fit.location)
    || !Number.isFinite(fit.trendPerYear)
  ) {
    throw new CsvError([issue('csv', 'scaleUnfit', { scale: fit.scale })])
  }
  return { maxima, fit, sampleSize: maxima.length }
}
