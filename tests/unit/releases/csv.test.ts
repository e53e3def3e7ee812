import { describe, expect, it } from 'vitest'
import { CsvError, csvCell, parseDrawsCsv, parseQuantileCsv, toCsv } from '../../../shared/releases/csv'
import { releaseCsv } from '../../../shared/releases/export'
import { CSV_MAX_BYTES, MAX_UPLOADED_DRAWS } from '../../../shared/releases/limits'

const issuesOf = (run: () => unknown) => {
  try {
    run()
  }
  catch (error) {
    // The field and its English words; the facts behind them are checked in tests/unit/wording/uploads.test.ts.
    if (error instanceof CsvError) return error.issues.map(({ field, message }) => ({ field, message }))
    throw error
  }
  throw new Error('expected a CsvError')
}

describe('quantile tables', () => {
  it('reads levels as rows and anchor years as columns into values per anchor year', () => {
    const table = parseQuantileCsv('level,2050,2100\r\n0.17,0.10,0.30\r\n0.5,0.20,0.50\r\n0.83,0.30,0.80\r\n')
    expect(table).toEqual({
      anchorYears: [2050, 2100],
      levels: [0.17, 0.5, 0.83],
      values: [
        [0.1, 0.2, 0.3],
        [0.3, 0.5, 0.8],
      ],
    })
  })

  it('accepts a byte-order mark, spaces around cells and blank trailing lines', () => {
    const table = parseQuantileCsv('\uFEFF level , 2050 \n 0.5 , 0.2 \n\n\n')
    expect(table.levels).toEqual([0.5])
  })

  it('names the row and column of every bad cell, as a spreadsheet numbers them', () => {
    const issues = issuesOf(() => parseQuantileCsv('level,2050,2100\n0.17,0.1,abc\n0.5,,0.5\n0.83,Infinity,NaN\n'))
    expect(issues).toEqual([
      { field: 'csv row 2, column 2100', message: '"abc" is not a finite number.' },
      { field: 'csv row 3, column 2050', message: 'Is empty; enter a number.' },
      { field: 'csv row 4, column 2050', message: '"Infinity" is not a finite number.' },
      { field: 'csv row 4, column 2100', message: '"NaN" is not a finite number.' },
    ])
  })

  it('refuses a wrong header, a non-year column, years out of order and a ragged row', () => {
    expect(issuesOf(() => parseQuantileCsv('prob,2050\n0.5,0.1\n'))[0]!.message).toMatch(/headed "level"/)
    expect(issuesOf(() => parseQuantileCsv('level,20S0\n0.5,0.1\n'))[0]!.message).toMatch(/Column 1 is "20S0"/)
    expect(issuesOf(() => parseQuantileCsv('level,2100,2050\n0.5,0.1,0.2\n'))[0]!.message).toMatch(/2050 follows 2100/)
    expect(issuesOf(() => parseQuantileCsv('level,2050,2100\n0.5,0.1\n'))).toEqual([
      { field: 'csv row 2', message: 'Has 2 cells but the header has 3.' },
    ])
  })

  it('refuses a file with only a header', () => {
    expect(issuesOf(() => parseQuantileCsv('level,2050\n'))[0]!.message).toMatch(/at least one row/)
  })
})

describe('draws', () => {
  it('reads one row per draw under a header of years', () => {
    expect(parseDrawsCsv('2050,2100\n0.1,0.3\n0.2,0.5\n')).toEqual({
      anchorYears: [2050, 2100],
      draws: [
        [0.1, 0.3],
        [0.2, 0.5],
      ],
    })
  })

  it('states the draw limit and the size limit', () => {
    const many = `2050\n${'0.1\n'.repeat(MAX_UPLOADED_DRAWS + 1)}`
    expect(issuesOf(() => parseDrawsCsv(many))[0]!.message).toBe(
      'At most 100,000 draws, got 100,001. Thin the draws evenly.',
    )
    const huge = `2050\n${'0.123456789\n'.repeat(Math.ceil(CSV_MAX_BYTES / 12) + 10)}`
    expect(issuesOf(() => parseDrawsCsv(huge))[0]!.message).toMatch(/larger than 8 MB/)
  })
})

describe('export', () => {
  it('writes a quantile release in the layout the upload reads back', () => {
    const distribution = {
      form: 'quantiles',
      anchorYears: [2050, 2100],
      levels: [0.17, 0.5, 0.83],
      values: [
        [0.1, 0.2, 0.3],
        [0.3, 0.5, 0.8],
      ],
    }
    expect(parseQuantileCsv(releaseCsv(distribution))).toEqual({
      anchorYears: [2050, 2100],
      levels: distribution.levels,
      values: distribution.values,
    })
  })

  it('neutralises cells a spreadsheet would run as formulas, but not negative numbers', () => {
    expect(csvCell('=HYPERLINK("x")')).toBe('"\'=HYPERLINK(""x"")"')
    expect(csvCell('@SUM(A1)')).toBe('\'@SUM(A1)')
    expect(csvCell('+1-2')).toBe('\'+1-2')
    expect(csvCell('-2+3')).toBe('\'-2+3')
    expect(csvCell(-0.25)).toBe('-0.25')
    expect(toCsv([['a,b', 'plain']])).toBe('"a,b",plain\r\n')
  })
})
