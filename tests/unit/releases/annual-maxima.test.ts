import { describe, expect, it } from 'vitest'
import { fitAnnualMaximaCsv } from '../../../shared/releases/annual-maxima'
import { CsvError } from '../../../shared/releases/csv'
import { fitGumbelByMoments, gumbelReturnLevel } from '../../../shared/engine'

// Twelve maxima rescaled to the worked example's sample mean 2.5 and standard deviation 0.7.
const raw = [1.1, 2.3, 1.7, 3.9, 2.2, 2.8, 1.5, 2.6, 3.1, 2.0, 2.4, 4.4]
const mean = raw.reduce((a, b) => a + b) / raw.length
const sd = Math.sqrt(raw.reduce((a, b) => a + (b - mean) ** 2, 0) / (raw.length - 1))
const values = raw.map(x => 2.5 + 0.7 * (x - mean) / sd)
const csv = `year,value\n${values.map((v, i) => `${1990 + i},${v.toFixed(12)}`).join('\n')}\n`

describe('annual maxima from CSV', () => {
  it('reads a year,value CSV, and the moments fit of what it read matches the worked example', () => {
    const fit = fitAnnualMaximaCsv(csv)
    expect(fit.sampleSize).toBe(12)
    expect(fit.maxima[0]).toEqual({ year: 1990, value: Number(values[0]!.toFixed(12)) })
    // [pub] Cornell CEE 304 course example: mean 2.5, sd 0.7 → location 2.185, scale 0.5458, 50-year level 4.315.
    const moments = fitGumbelByMoments(fit.maxima.map(m => m.value))
    expect(moments.location).toBeCloseTo(2.185, 3)
    expect(moments.scale).toBeCloseTo(0.5458, 4)
    expect(gumbelReturnLevel(moments, 50)).toBeCloseTo(4.315, 2)
  })

  it('fits by L-moments as Hosking & Wallis define them', () => {
    const fit = fitAnnualMaximaCsv(csv)
    // [pub] Hosking & Wallis (1997): b0 = mean, b1 = (1/n) Σ (j−1)/(n−1) x(j) ascending, λ = (2b1 − b0)/ln 2, μ = b0 − 0.5772 λ.
    const sorted = fit.maxima.map(m => m.value).sort((a, b) => a - b)
    const b0 = sorted.reduce((a, b) => a + b) / sorted.length
    const b1 = sorted.reduce((sum, x, j) => sum + (j / (sorted.length - 1)) * x, 0) / sorted.length
    const scale = (2 * b1 - b0) / Math.LN2
    expect(fit.gumbel.scale).toBeCloseTo(scale, 12)
    expect(fit.gumbel.location).toBeCloseTo(b0 - 0.5772156649 * scale, 6)
  })

  it('sorts the years and refuses fewer than ten of them', () => {
    const shuffled = `year,value\n2001,1.1\n1999,1.4\n${Array.from({ length: 8 }, (_, i) => `${2002 + i},1.2`).join('\n')}\n`
    expect(fitAnnualMaximaCsv(shuffled).maxima[0]!.year).toBe(1999)
    expect(() => fitAnnualMaximaCsv('year,value\n2001,1.1\n')).toThrow(CsvError)
  })
})
