import { describe, expect, it } from 'vitest'
import {
  ANNUAL_MAXIMUM_BOUNDS,
  fitAnnualMaximaCsv,
  MIN_ANNUAL_MAXIMA_YEARS,
} from '../../../shared/releases/annual-maxima'
import { CsvError } from '../../../shared/releases/csv'
import { fitGumbelByMoments, gumbelReturnLevel } from '../../../shared/engine'
import { fitGumbelWithTrend } from '../../../shared/engine/gumbel-trend'

const EPOCH = 2005

// Twenty-four maxima rescaled to the worked example's sample mean 2.5 and standard deviation 0.7.
const raw = [
  1.1, 2.3, 1.7, 3.9, 2.2, 2.8, 1.5, 2.6, 3.1, 2.0, 2.4, 4.4, 1.9, 2.7, 1.3, 3.4, 2.1, 2.9, 1.8, 3.6, 2.5, 1.6, 3.0,
  2.2,
]
const mean = raw.reduce((a, b) => a + b) / raw.length
const sd = Math.sqrt(raw.reduce((a, b) => a + (b - mean) ** 2, 0) / (raw.length - 1))
const values = raw.map(x => 2.5 + 0.7 * (x - mean) / sd)
const csvOf = (rows: [number, number | string][]) =>
  `year,value\n${rows.map(([year, value]) => `${year},${value}`).join('\n')}\n`
const csv = csvOf(values.map((v, i) => [1990 + i, v.toFixed(12)]))
/** A plain record of `count` years from 1990, levels about 1.5 m. */
const plain = (count: number, value: (i: number) => number | string = i => (1.4 + (i * 7 % 11) * 0.03).toFixed(2)) =>
  csvOf(Array.from({ length: count }, (_, i) => [1990 + i, value(i)]))

function issuesOf(run: () => unknown): { field: string, message: string }[] {
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

describe('annual maxima from CSV', () => {
  it('reads a year,value CSV, and the moments fit of what it read matches the worked example', () => {
    const { maxima, sampleSize } = fitAnnualMaximaCsv(csv, EPOCH)
    expect(sampleSize).toBe(24)
    expect(maxima[0]).toEqual({ year: 1990, value: Number(values[0]!.toFixed(12)) })
    // [pub] Cornell CEE 304 course example: mean 2.5, sd 0.7 → location 2.185, scale 0.5458, 50-year level 4.315.
    const moments = fitGumbelByMoments(maxima.map(m => m.value))
    expect(moments.location).toBeCloseTo(2.185, 3)
    expect(moments.scale).toBeCloseTo(0.5458, 4)
    expect(gumbelReturnLevel(moments, 50)).toBeCloseTo(4.315, 2)
  })

  it('fits the trend Gumbel by maximum likelihood, with the location at the site\'s reference epoch', () => {
    const { maxima, fit } = fitAnnualMaximaCsv(csv, EPOCH)
    expect(fit).toEqual(fitGumbelWithTrend(maxima, EPOCH))
    // [practice] the same line read at another epoch: μ(2030) = μ(2005) + 25·μ₁.
    const later = fitAnnualMaximaCsv(csv, 2030).fit
    expect(later.location).toBeCloseTo(fit.location + 25 * fit.trendPerYear, 9)
    expect([fit.firstYear, fit.lastYear, fit.sampleSize]).toEqual([1990, 2013, 24])
  })

  it('sorts the years and accepts a gap in them', () => {
    const rows: [number, string][] = Array.from({ length: 22 }, (_, i) => [
      i < 10 ? 1970 + i : 1990 + i,
      (1.5 + (i % 4) * 0.07).toFixed(2),
    ])
    const { maxima, fit } = fitAnnualMaximaCsv(csvOf([rows[5]!, ...rows.slice(0, 5), ...rows.slice(6)]), EPOCH)
    expect(maxima.map(m => m.year)).toEqual(rows.map(([year]) => year))
    expect([fit.firstYear, fit.lastYear]).toEqual([1970, 2011])
  })

  it(`refuses fewer than ${MIN_ANNUAL_MAXIMA_YEARS} years and says why`, () => {
    expect(MIN_ANNUAL_MAXIMA_YEARS).toBe(20)
    expect(fitAnnualMaximaCsv(plain(20), EPOCH).sampleSize).toBe(20)
    const [issue] = issuesOf(() => fitAnnualMaximaCsv(plain(19), EPOCH))
    expect(issue!.field).toBe('csv')
    expect(issue!.message).toMatch(
      /At least 20 years of annual maxima are needed, got 19: a trend and a scale from fewer years are too uncertain to plan with/,
    )
  })

  it('accepts the bounds themselves and refuses values outside them, naming the row', () => {
    expect(ANNUAL_MAXIMUM_BOUNDS).toEqual({ min: -20, max: 20 })
    expect(
      fitAnnualMaximaCsv(
        plain(24, i => (i === 3 ? 20 : i === 4 ? -20 : 1.5 + (i % 5) * 0.04)),
        EPOCH,
      ).sampleSize,
    ).toBe(24)
    const issues = issuesOf(() =>
      fitAnnualMaximaCsv(
        plain(24, i => (i === 3 ? 20.01 : i === 7 ? 1e12 : i === 9 ? -25 : 1.5 + (i % 5) * 0.04)),
        EPOCH,
      ),
    )
    expect(issues.map(issue => issue.field)).toEqual([
      'csv row 5, column value',
      'csv row 9, column value',
      'csv row 11, column value',
    ])
    expect(issues[1]!.message).toMatch(
      /^1000000000000 is outside -20 to 20 m above the site's datum; enter the level in metres/,
    )
    expect(issues[1]!.message).toMatch(/check this value for a typing error/)
  })

  it('says when the values look like centimetres or millimetres', () => {
    const cm = issuesOf(() => fitAnnualMaximaCsv(plain(24, i => 140 + (i % 6) * 4), EPOCH))
    expect(cm[0]).toEqual({
      field: 'csv row 2, column value',
      message: '140 is outside -20 to 20 m above the site\'s datum; these look like centimetres: divide by 100.',
    })
    expect(cm).toHaveLength(10)
    const mm = issuesOf(() => fitAnnualMaximaCsv(plain(24, i => 2400 + (i % 6) * 40), EPOCH))
    expect(mm[0]!.message).toMatch(/these look like millimetres: divide by 1000\.$/)
    // 2–20 m in centimetres or 0.2–2 m in millimetres: both are named.
    const either = issuesOf(() => fitAnnualMaximaCsv(plain(24, i => 1500 + (i % 6) * 20), EPOCH))
    expect(either[0]!.message).toMatch(
      /these look like centimetres: divide by 100 \(or by 1000 if they are millimetres\)\.$/,
    )
  })

  it('refuses values that are not finite numbers', () => {
    expect(issuesOf(() => fitAnnualMaximaCsv(plain(24, i => (i === 2 ? 'Infinity' : 1.5 + (i % 3) * 0.1)), EPOCH))[0])
      .toEqual({ field: 'csv row 4, column value', message: '"Infinity" is not a finite number.' })
    expect(
      issuesOf(() =>
        fitAnnualMaximaCsv(
          plain(24, i => (i === 2 ? '' : 1.5 + (i % 3) * 0.1)),
          EPOCH,
        ),
      )[0]!.message,
    ).toMatch(/Is empty; enter a number/)
  })

  it('refuses repeated years, non-years and a wrong header', () => {
    const repeated = csvOf(Array.from({ length: 24 }, (_, i) => [i === 3 ? 1992 : 1990 + i, 1.5 + (i % 4) * 0.05]))
    expect(issuesOf(() => fitAnnualMaximaCsv(repeated, EPOCH))[0]).toEqual({
      field: 'csv row 5, column year',
      message: '1992 appears twice; give one maximum per year.',
    })
    const fractional = csvOf(Array.from({ length: 24 }, (_, i) => [i === 6 ? 1996.5 : 1990 + i, 1.5 + (i % 4) * 0.05]))
    expect(issuesOf(() => fitAnnualMaximaCsv(fractional, EPOCH))[0]).toMatchObject({
      field: 'csv row 8, column year',
      message: expect.stringMatching(/"1996.5" is not a year between 1800 and 2200/),
    })
    const early = csvOf(Array.from({ length: 24 }, (_, i) => [i === 0 ? 1799 : 1990 + i, 1.5 + (i % 4) * 0.05]))
    expect(issuesOf(() => fitAnnualMaximaCsv(early, EPOCH))[0]!.field).toBe('csv row 2, column year')
    expect(issuesOf(() => fitAnnualMaximaCsv('when,level\n2001,1.2\n', EPOCH))[0]!.message).toMatch(
      /The header must be "year,value"/,
    )
  })

  it('refuses a record that leaves no spread for a Gumbel scale', () => {
    const line = plain(24, i => (1.2 + 0.01 * i).toFixed(2))
    const [issue] = issuesOf(() => fitAnnualMaximaCsv(line, EPOCH))
    expect(issue!.field).toBe('csv')
    expect(issue!.message).toMatch(
      /^No Gumbel fit: the maxima lie on a straight line in time.*not a smoothed or fitted series\.$/,
    )
  })

  it('refuses a reference epoch more than 100 years from the record', () => {
    // plain(24) runs from 1990 to 2013.
    expect(fitAnnualMaximaCsv(plain(24), 1890).fit.firstYear).toBe(1990)
    expect(fitAnnualMaximaCsv(plain(24), 2113).fit.lastYear).toBe(2013)
    for (const epoch of [1889, 2114, Number.NaN]) {
      const [issue] = issuesOf(() => fitAnnualMaximaCsv(plain(24), epoch))
      expect(issue!.field).toBe('reference epoch')
      expect(issue!.message).toMatch(/must be within 100 years of the record \(1990–2013\)/)
    }
  })
})
