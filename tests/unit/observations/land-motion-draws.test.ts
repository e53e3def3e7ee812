import { describe, expect, it } from 'vitest'
import { CsvError } from '#shared/releases/csv'
import { parseLandMotionDrawsCsv, summariseLandDraws } from '#shared/observations/land-motion-draws'

const csv = (rows: string[]) => `draw,rate_mm_per_year\n${rows.join('\n')}\n`
const numbered = (n: number, rate: (i: number) => string) => Array.from({ length: n }, (_, k) => `${k + 1},${rate(k + 1)}`)

function issuesOf(text: string) {
  try {
    parseLandMotionDrawsCsv(text)
  }
  catch (error) {
    if (error instanceof CsvError) return error.issues.map(issue => [issue.field, issue.message])
    throw error
  }
  return []
}

describe('land-motion draws from CSV', () => {
  it('puts each rate at its draw number, whatever the row order', () => {
    const rows = numbered(120, i => String(i / 10)).reverse()
    const rates = parseLandMotionDrawsCsv(csv(rows))
    expect(rates).toHaveLength(120)
    expect(rates[0]).toBe(0.1)
    expect(rates[119]).toBe(12)
  })

  it('names the row and column of each problem', () => {
    const rows = numbered(100, () => '-1.5')
    rows[3] = '4,abc'
    rows[5] = '1,2'
    rows[7] = 'x,2'
    rows[9] = '10,-250'
    expect(issuesOf(csv(rows))).toEqual([
      ['csv row 5, column rate_mm_per_year', '"abc" is not a number.'],
      ['csv row 7, column draw', 'Draw 1 is also on row 2; give one rate per draw.'],
      ['csv row 9, column draw', '"x" is not a draw number; number the draws 1, 2, 3, … (the same numbers as the release\'s draws when linked).'],
      ['csv row 11, column rate_mm_per_year', '-250 mm/yr is outside -100 to 100 mm/yr; enter the rate in millimetres per year (positive: the land rises).'],
    ])
    expect(issuesOf(csv(numbered(100, () => '1')).replace('rate_mm_per_year', 'rate'))[0]![0]).toBe('csv header')
    expect(issuesOf(csv(numbered(20, () => '1')))[0]![1]).toContain('At least 100 draws are needed, got 20')
    // A number past the count is one the file cannot hold once each: draws are numbered 1…n.
    expect(issuesOf(csv([...numbered(99, () => '1'), '101,1']))[0]).toEqual([
      'csv row 101, column draw',
      '"101" is not a draw number; number the draws 1, 2, 3, … (the same numbers as the release\'s draws when linked).',
    ])
  })

  it('summarises by type-7 percentiles (Hyndman & Fan 1996, R\'s default)', () => {
    // 1…101: the p-quantile of type 7 is 1 + 100p exactly.
    const summary = summariseLandDraws(Array.from({ length: 101 }, (_, i) => 101 - i))
    expect(summary).toEqual({ count: 101, mean: 51, median: 51, p5: 6, p95: 96 })
  })
})
