import Papa from 'papaparse'
import { uploadIssue as issue } from '../wording/uploads'
import type { WordParams } from '../wording/translate'
import { CSV_MAX_BYTES, MAX_ANCHOR_YEARS, MAX_QUANTILE_LEVELS, MAX_UPLOADED_DRAWS } from './limits'

// Parsing of uploaded tables. Every refusal names the row and column to fix; rows are counted
// as a spreadsheet shows them (the header is row 1). Each issue carries its facts (`code`, `params`:
// shared/wording/uploads.ts) so a page words it in the reader's language, and English for the API.

export interface CsvIssue { field: string, message: string, code?: string, params?: WordParams }

export class CsvError extends Error {
  constructor(readonly issues: CsvIssue[]) {
    super(issues.map(issue => `${issue.field}: ${issue.message}`).join(' '))
    this.name = 'CsvError'
  }
}

const MAX_ISSUES = 10

export function readGrid(text: string): string[][] {
  if (new TextEncoder().encode(text).length > CSV_MAX_BYTES) {
    throw new CsvError([issue('csv', 'tooLarge', { mb: CSV_MAX_BYTES / 1024 / 1024 })])
  }
  const parsed = Papa.parse<string[]>(text.replace(/^\uFEFF/, ''), { skipEmptyLines: 'greedy' })
  const fatal = parsed.errors.find(error => error.type === 'Quotes')
  if (fatal)
    throw new CsvError([issue(`csv row ${(fatal.row ?? 0) + 1}`, 'quotes')])
  if (parsed.data.length < 2) throw new CsvError([issue('csv', 'needsRows')])
  return parsed.data.map(row => row.map(cell => cell.trim()))
}

function headerYears(cells: string[], field: string): number[] {
  const issues: CsvIssue[] = []
  const years = cells.map((cell, i) => {
    const year = Number(cell)
    if (!/^\d{4}$/.test(cell)) issues.push(issue(field, 'yearColumn', { column: i + 1, cell }))
    return year
  })
  for (let i = 1; i < years.length && !issues.length; i++) {
    if (years[i]! <= years[i - 1]!)
      issues.push(issue(field, 'yearsIncrease', { year: years[i]!, previous: years[i - 1]! }))
  }
  if (years.length > MAX_ANCHOR_YEARS)
    issues.push(issue(field, 'tooManyYears', { max: MAX_ANCHOR_YEARS, count: years.length }))
  if (issues.length) throw new CsvError(issues)
  return years
}

/** Numbers of one data row, or issues naming each bad cell. */
function rowNumbers(row: string[], rowNumber: number, columns: string[], issues: CsvIssue[]): number[] {
  if (row.length !== columns.length) {
    issues.push(issue(`csv row ${rowNumber}`, 'cellCount', { cells: row.length, columns: columns.length }))
    return []
  }
  return row.map((cell, c) => {
    const value = cell === '' ? Number.NaN : Number(cell)
    if (!Number.isFinite(value)) {
      const field = `csv row ${rowNumber}, column ${columns[c]}`
      issues.push(cell === '' ? issue(field, 'emptyCell') : issue(field, 'notFinite', { cell: cell.slice(0, 40) }))
    }
    return value
  })
}

/** A header row and rows of finite numbers (the first cell of each row included). */
export function parseNumberGrid(text: string): { header: string[], rows: number[][] } {
  const [header, ...rows] = readGrid(text)
  const issues: CsvIssue[] = []
  const numbers = rows.map((row, r) => rowNumbers(row, r + 2, header!, issues))
  if (issues.length) throw new CsvError(issues.slice(0, MAX_ISSUES))
  return { header: header!, rows: numbers }
}

export interface QuantileTable { anchorYears: number[], levels: number[], values: number[][] }

/**
 * A quantile table: header `level,<year>,<year>…`, then one row per probability level. Returns
 * values per anchor year (values[a][k]), the engine's layout.
 */
export function parseQuantileCsv(text: string): QuantileTable {
  const [header, ...rows] = readGrid(text)
  if (header![0]!.toLowerCase() !== 'level') {
    throw new CsvError([issue('csv header', 'levelHeader', { cell: header![0]! })])
  }
  const anchorYears = headerYears(header!.slice(1), 'csv header')
  if (rows.length > MAX_QUANTILE_LEVELS)
    throw new CsvError([issue('csv', 'tooManyLevels', { max: MAX_QUANTILE_LEVELS, count: rows.length })])
  const issues: CsvIssue[] = []
  const columns = header!
  const table = rows.map((row, r) => rowNumbers(row, r + 2, columns, issues))
  if (issues.length) throw new CsvError(issues.slice(0, MAX_ISSUES))
  const levels = table.map(row => row[0]!)
  const values = anchorYears.map((_, a) => table.map(row => row[a + 1]!))
  return { anchorYears, levels, values }
}

export interface DrawTable { anchorYears: number[], draws: number[][] }

/** Draws: header of anchor years, then one row per draw. */
export function parseDrawsCsv(text: string): DrawTable {
  const [header, ...rows] = readGrid(text)
  const anchorYears = headerYears(header!, 'csv header')
  if (rows.length > MAX_UPLOADED_DRAWS) {
    throw new CsvError([issue('csv', 'tooManyDraws', { max: MAX_UPLOADED_DRAWS, count: rows.length })])
  }
  const issues: CsvIssue[] = []
  const draws: number[][] = []
  for (let r = 0; r < rows.length && issues.length < MAX_ISSUES; r++)
    draws.push(rowNumbers(rows[r]!, r + 2, header!, issues))
  if (issues.length) throw new CsvError(issues.slice(0, MAX_ISSUES))
  return { anchorYears, draws }
}

/**
 * Cells that a spreadsheet would run as a formula are prefixed with a quote on export, so an
 * exported release cannot execute anything when opened.
 */
export function csvCell(value: string | number): string {
  const text = String(value)
  const isPlainNumber = text.trim() !== '' && Number.isFinite(Number(text))
  const guarded = /^[=+\-@\t\r]/.test(text) && !isPlainNumber ? `'${text}` : text
  return /[",\n\r]/.test(guarded) ? `"${guarded.replace(/"/g, '""')}"` : guarded
}

export function toCsv(rows: (string | number)[][]): string {
  return rows.map(row => row.map(csvCell).join(',')).join('\r\n') + '\r\n'
}
