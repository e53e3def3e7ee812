import { CsvError, readGrid, type CsvIssue } from '../releases/csv'
import { uploadIssue as issue } from '../wording/uploads'
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
  if (typical > 2000) return 'millimetres'
  if (typical > 200) return 'millimetresOrCentimetres'
  if (typical > 20) return 'centimetres'
  return 'checkMean'
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
  throw new CsvError([issue('csv header', 'gaugeHeader', { header: header.join(',') })])
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
    throw new CsvError([issue('csv', 'tooManyValues', { max: MAX_GAUGE_VALUES, count: rows.length })])
  }
  const values: GaugeValue[] = []
  rows.forEach((row, r) => {
    const at = `csv row ${r + 2}`
    if (row.length < columns.length - (hasFlag ? 1 : 0) || row.length > columns.length) {
      issues.push(issue(at, 'cellCount', { cells: row.length, columns: columns.length }))
      return
    }
    const year = Number(row[0])
    const month = resolution === 'monthly' ? Number(row[1]) : null
    const heightCell = row[resolution === 'monthly' ? 2 : 1]!
    const height = heightCell === '' ? Number.NaN : Number(heightCell)
    // Flags are text a person typed: the same rule as every text field (no control characters).
    const flag = hasFlag ? withoutControls(row[columns.length - 1] ?? '').slice(0, 40) || null : null
    if (!/^\d{4}$/.test(row[0]!) || year < FIRST_YEAR || year > LAST_YEAR)
      issues.push(issue(`${at}, column year`, 'notYear', { cell: row[0]!, first: FIRST_YEAR, last: LAST_YEAR }))
    if (month !== null && !(Number.isInteger(month) && month >= 1 && month <= 12))
      issues.push(issue(`${at}, column month`, 'notMonth', { cell: row[1]! }))
    if (!Number.isFinite(height)) {
      const field = `${at}, column height`
      issues.push(
        heightCell === '' ? issue(field, 'emptyHeight') : issue(field, 'notNumber', { cell: heightCell.slice(0, 40) }),
      )
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
      const code = resolution === 'annual' ? 'yearAgain' : 'monthAgain'
      issues.push(issue(`${at}, column year`, code, { time: label(value), row: previous }))
    }
    seen.set(index(value), r + 2)
    const { min, max } = GAUGE_HEIGHT_BOUNDS
    if (!(value.height >= min && value.height <= max)) {
      issues.push(issue(`${at}, column height`, 'outside', { value: String(value.height), min, max, advice }))
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
