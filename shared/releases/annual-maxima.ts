import { EngineInputError } from '../engine/errors'
import { fitGumbelWithTrend, type TrendGumbelFit } from '../engine/gumbel-trend'
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
  if (typical > 2000) return 'these look like millimetres: divide by 1000.'
  if (typical > 200) return 'these look like centimetres: divide by 100 (or by 1000 if they are millimetres).'
  if (typical > 20) return 'these look like centimetres: divide by 100.'
  return 'enter the level in metres above the site\'s datum, and check this value for a typing error.'
}

function rowIssues(rows: number[][]): CsvIssue[] {
  const issues: CsvIssue[] = []
  const seen = new Set<number>()
  const { min, max } = ANNUAL_MAXIMUM_BOUNDS
  const advice = unitAdvice(rows.map(([, value]) => value!))
  rows.forEach(([year, value], r) => {
    const row = `csv row ${r + 2}`
    if (!Number.isInteger(year) || year! < FIRST_YEAR || year! > LAST_YEAR) {
      issues.push({
        field: `${row}, column year`,
        message: `"${year}" is not a year between ${FIRST_YEAR} and ${LAST_YEAR}; enter the whole year, like 1998.`,
      })
    }
    else if (seen.has(year!)) {
      issues.push({ field: `${row}, column year`, message: `${year} appears twice; give one maximum per year.` })
    }
    seen.add(year!)
    if (!(value! >= min && value! <= max)) {
      issues.push({
        field: `${row}, column value`,
        message: `${value} is outside ${min} to ${max} m above the site's datum; ${advice}`,
      })
    }
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
    throw new CsvError([
      { field: 'csv header', message: `The header must be "year,value", got "${header.join(',')}".` },
    ])
  }
  const issues = rowIssues(rows).slice(0, MAX_ROW_ISSUES)
  if (rows.length < MIN_ANNUAL_MAXIMA_YEARS) {
    issues.push({
      field: 'csv',
      message: `At least ${MIN_ANNUAL_MAXIMA_YEARS} years of annual maxima are needed, got ${rows.length}: a trend and a scale from fewer years are too uncertain to plan with. Add earlier years from the gauge's archive, or enter the Gumbel location and scale by hand.`,
    })
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
      {
        field: 'reference epoch',
        message: `The site's reference epoch (${referenceEpoch}) must be within ${MAX_EPOCH_DISTANCE_YEARS} years of the record (${firstYear}–${lastYear}); a trend carried further than that is not a fit to plan with. Check the site's reference epoch and the years in the file.`,
      },
    ])
  }

  let fit: TrendGumbelFit
  try {
    fit = fitGumbelWithTrend(maxima, referenceEpoch)
  }
  catch (error) {
    if (!(error instanceof EngineInputError)) throw error
    throw new CsvError(error.issues.map(issue => ({ field: 'csv', message: `No Gumbel fit: ${issue.message}.` })))
  }
  if (
    !(fit.scale > 0)
    || !Number.isFinite(fit.scale)
    || !Number.isFinite(fit.location)
    || !Number.isFinite(fit.trendPerYear)
  ) {
    throw new CsvError([
      {
        field: 'csv',
        message: `No Gumbel fit: the fitted scale came out as ${fit.scale} m; check the values for a unit mix-up or an outlier.`,
      },
    ])
  }
  return { maxima, fit, sampleSize: maxima.length }
}
