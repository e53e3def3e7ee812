import { CsvError, readGrid, type CsvIssue } from '../releases/csv'
import { withoutControls } from '../schemas/text'
import type { GaugePoint, GaugeResolution } from './gauge-trend'

// A site's tide-gauge record of mean sea level from CSV: `year,height` for annual means or
// `year,month,height` for monthly means, each optionally followed by a `flag` column. Heights are metres
// above the site's datum. Gaps are allowed and listed; a time given twice, a value in the wrong unit or
// a row that is not numbers is refused with the row and column to fix.

/** Plausible mean sea levels, metres above a site's datum: outside this the value is in another unit. */
export const GAUGE_HEIGHT_BOUNDS = { min: -20, max: 20 } as const
export const MAX_GAUGE_VALUES = 12 * 300
const FIRST_YEAR = 1700
const LAST_YEAR = 2200
const MAX_ISSUES = 10

export interface GaugeValue {
  year: number
  /** 1–12 for a monthly record, null for annual means. */
  month: number | null
  height: number
  /** The gauge operator's flag, as given; a flagged value is shown but not fitted. */
  flag: string | null
}

export interface GaugeRecord {
  resolution: GaugeResolution
  values: GaugeValue[]
  /** Missing stretches inside the record, as inclusive ranges of the record's time labels. */
  gaps: { from: string, to: string, missing: number }[]
}

function unitAdvice(heights: number[]): string {
  const sizes = heights.map(Math.abs).sort((a, b) => a - b)
  const typical = sizes[Math.floor(sizes.length / 2)] ?? 0
  if (typical > 2000) return 'these look like millimetres: divide by 1000.'
  if (typical > 200)
    return 'these look like millimetres or centimetres: divide by 1000 if millimetres, by 100 if centimetres.'
  if (typical > 20) return 'these look like centimetres: divide by 100.'
  return 'enter the mean sea level in metres above the site\'s datum, and check this value for a typing error.'
}

function readHeader(header: string[]): { resolution: GaugeResolution, hasFlag: boolean } {
  const names = header.map(cell => cell.toLowerCase())
  const expected = [['year', 'height'], ['year', 'month', 'height']]
  for (const columns of expected) {
    const same = columns.every((name, i) => names[i] === name)
    if (
      same
      && (names.length === columns.length || (names.length === columns.length + 1 && names[columns.length] === 'flag'))
    ) {
      return { resolution: columns.length === 2 ? 'annual' : 'monthly', hasFlag: names.length > columns.length }
    }
  }
  throw new CsvError([
    {
      field: 'csv header',
      message: `The header must be "year,height" (annual means) or "year,month,height" (monthly means), optionally followed by ",flag"; got "${header.join(',')}".`,
    },
  ])
}

function label(value: { year: number, month: number | null }): string {
  return value.month === null ? String(value.year) : `${value.year}-${String(value.month).padStart(2, '0')}`
}

function index(value: { year: number, month: number | null }): number {
  return value.month === null ? value.year : value.year * 12 + value.month - 1
}

function findGaps(values: GaugeValue[]): GaugeRecord['gaps'] {
  const gaps: GaugeRecord['gaps'] = []
  for (let i = 1; i < values.length; i++) {
    const missing = index(values[i]!) - index(values[i - 1]!) - 1
    if (missing < 1) continue
    const before = values[i - 1]!
    const after = values[i]!
    const first
      = before.month === null
        ? { year: before.year + 1, month: null }
        : { year: before.year + Math.floor(before.month / 12), month: (before.month % 12) + 1 }
    const last
      = after.month === null
        ? { year: after.year - 1, month: null }
        : { year: after.month === 1 ? after.year - 1 : after.year, month: after.month === 1 ? 12 : after.month - 1 }
    gaps.push({ from: label(first), to: label(last), missing })
  }
  return gaps
}

export function parseGaugeRecordCsv(text: string): GaugeRecord {
  const [header, ...rows] = readGrid(text)
  const { resolution, hasFlag } = readHeader(header!)
  const columns = header!.map(cell => cell.toLowerCase())
  const issues: CsvIssue[] = []
  if (rows.length > MAX_GAUGE_VALUES) {
    throw new CsvError([
      { field: 'csv', message: `At most ${MAX_GAUGE_VALUES} values (300 years of monthly means), got ${rows.length}.` },
    ])
  }
  const values: GaugeValue[] = []
  rows.forEach((row, r) => {
    const at = `csv row ${r + 2}`
    if (row.length < columns.length - (hasFlag ? 1 : 0) || row.length > columns.length) {
      issues.push({ field: at, message: `Has ${row.length} cells but the header has ${columns.length}.` })
      return
    }
    const year = Number(row[0])
    const month = resolution === 'monthly' ? Number(row[1]) : null
    const heightCell = row[resolution === 'monthly' ? 2 : 1]!
    const height = heightCell === '' ? Number.NaN : Number(heightCell)
    // Flags are text a person typed: the same rule as every text field (no control characters).
    const flag = hasFlag ? withoutControls(row[columns.length - 1] ?? '').slice(0, 40) || null : null
    if (!/^\d{4}$/.test(row[0]!) || year < FIRST_YEAR || year > LAST_YEAR) {
      issues.push({
        field: `${at}, column year`,
        message: `"${row[0]}" is not a year between ${FIRST_YEAR} and ${LAST_YEAR}; enter the whole year, like 1998.`,
      })
    }
    if (month !== null && !(Number.isInteger(month) && month >= 1 && month <= 12)) {
      issues.push({ field: `${at}, column month`, message: `"${row[1]}" is not a month; enter 1 to 12.` })
    }
    if (!Number.isFinite(height)) {
      issues.push({
        field: `${at}, column height`,
        message:
          heightCell === ''
            ? 'Is empty; leave the row out for a missing value, or enter the height in metres.'
            : `"${heightCell.slice(0, 40)}" is not a number.`,
      })
    }
    values.push({ year, month, height, flag })
  })
  if (issues.length) throw new CsvError(issues.slice(0, MAX_ISSUES))

  const advice = unitAdvice(values.map(value => value.height))
  const seen = new Map<number, number>()
  values.forEach((value, r) => {
    const at = `csv row ${r + 2}`
    const previous = seen.get(index(value))
    if (previous !== undefined) {
      issues.push({
        field: `${at}, column year`,
        message: `${label(value)} is also on row ${previous}; give one value per ${resolution === 'annual' ? 'year' : 'month'}.`,
      })
    }
    seen.set(index(value), r + 2)
    const { min, max } = GAUGE_HEIGHT_BOUNDS
    if (!(value.height >= min && value.height <= max)) {
      issues.push({
        field: `${at}, column height`,
        message: `${value.height} is outside ${min} to ${max} m above the site's datum; ${advice}`,
      })
    }
  })
  if (issues.length) throw new CsvError(issues.slice(0, MAX_ISSUES))

  values.sort((a, b) => index(a) - index(b))
  return { resolution, values, gaps: findGaps(values) }
}

/** The values a fit uses: unflagged ones, at the middle of their year or month. */
export function gaugePoints(record: GaugeRecord): GaugePoint[] {
  return record.values
    .filter(value => value.flag === null)
    .map(value => ({
      time: value.month === null ? value.year + 0.5 : value.year + (value.month - 0.5) / 12,
      height: value.height,
    }))
}
