import { CsvError, readGrid, type CsvIssue } from '../releases/csv'
import { MAX_UPLOADED_DRAWS } from '../releases/limits'
import { uploadIssue as issue } from '../wording/uploads'

// A site's land motion as posterior draws of its rate, from CSV `draw,rate_mm_per_year`: draw numbers
// 1…n, each once, in any order (the draw number is the shared index with a linked release's draws, whose
// draw j is its j-th row). Rates are mm/yr, positive where the land rises, as the site's rate.

/** Plausible land-motion rates in mm/yr (the site form's bounds): outside them the unit is wrong. */
export const LAND_RATE_BOUNDS = { min: -100, max: 100 } as const
export const MIN_LAND_DRAWS = 100
const MAX_ISSUES = 10
const HEADER = ['draw', 'rate_mm_per_year']

/** Rates in draw order (index 0 is draw 1). */
export function parseLandMotionDrawsCsv(text: string): number[] {
  const [header, ...rows] = readGrid(text)
  if (header!.length !== 2 || header!.some((cell, i) => cell.toLowerCase() !== HEADER[i]))
    throw new CsvError([issue('csv header', 'landDrawsHeader', { header: header!.join(',') })])
  if (rows.length > MAX_UPLOADED_DRAWS)
    throw new CsvError([issue('csv', 'tooManyDraws', { max: MAX_UPLOADED_DRAWS, count: rows.length })])
  if (rows.length < MIN_LAND_DRAWS)
    throw new CsvError([issue('csv', 'tooFewLandDraws', { min: MIN_LAND_DRAWS, count: rows.length })])
  const issues: CsvIssue[] = []
  const rates = new Array<number>(rows.length).fill(Number.NaN)
  const rowOf = new Int32Array(rows.length)
  rows.forEach((row, r) => {
    const at = `csv row ${r + 2}`
    if (row.length !== 2) {
      issues.push(issue(at, 'cellCount', { cells: row.length, columns: 2 }))
      return
    }
    const [drawCell, rateCell] = row as [string, string]
    const draw = Number(drawCell)
    const rate = rateCell === '' ? Number.NaN : Number(rateCell)
    const known = /^\d+$/.test(drawCell) && draw >= 1 && draw <= rows.length
    if (!known) issues.push(issue(`${at}, column draw`, 'notDrawIndex', { cell: drawCell.slice(0, 40) }))
    if (!Number.isFinite(rate)) {
      const field = `${at}, column rate_mm_per_year`
      issues.push(rateCell === '' ? issue(field, 'emptyCell') : issue(field, 'notNumber', { cell: rateCell.slice(0, 40) }))
    }
    else if (rate < LAND_RATE_BOUNDS.min || rate > LAND_RATE_BOUNDS.max) {
      issues.push(issue(`${at}, column rate_mm_per_year`, 'rateOutside', { value: rate, ...LAND_RATE_BOUNDS }))
    }
    // n rows numbered within 1…n with none twice leave none out.
    if (!known) return
    if (rowOf[draw - 1]) issues.push(issue(`${at}, column draw`, 'drawAgain', { draw, row: rowOf[draw - 1]! }))
    else {
      rowOf[draw - 1] = r + 2
      rates[draw - 1] = rate
    }
  })
  if (issues.length) throw new CsvError(issues.slice(0, MAX_ISSUES))
  return rates
}

export interface LandDrawsSummary {
  count: number
  mean: number
  median: number
  p5: number
  p95: number
}

/** Median and the 5–95 % range of the draws (linear interpolation between order statistics, type 7). */
export function summariseLandDraws(rates: number[]): LandDrawsSummary {
  const sorted = Float64Array.from(rates).sort()
  const at = (p: number) => {
    const h = (sorted.length - 1) * p
    const low = Math.floor(h)
    const high = Math.min(low + 1, sorted.length - 1)
    return sorted[low]! + (h - low) * (sorted[high]! - sorted[low]!)
  }
  let sum = 0
  for (const rate of sorted) sum += rate
  return { count: sorted.length, mean: sum / sorted.length, median: at(0.5), p5: at(0.05), p95: at(0.95) }
}
