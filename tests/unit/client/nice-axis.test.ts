import { describe, expect, it } from 'vitest'
import { niceAxis, niceYearAxis, yearAxisLabel } from '../../../shared/charts/nice-axis'

describe('nice axis bounds', () => {
  it('puts both ends on whole steps of 1, 2 or 5 times a power of ten', () => {
    // [practice] 1-2-5 steps, the common chart practice: 0.13 … 1.27 over about 5 steps → steps of 0.2 from 0 to 1.4.
    expect(niceAxis(0.13, 1.27)).toEqual({ min: 0, max: 1.4, interval: 0.2 })
    expect(niceAxis(0.3, 0.9)).toEqual({ min: 0.3, max: 0.9, interval: 0.1 })
    expect(niceAxis(-0.42, 2.3)).toEqual({ min: -0.5, max: 2.5, interval: 0.5 })
    for (const [low, high] of [[0.013, 0.077], [1.7, 6.2], [0.31, 0.33]] as const) {
      const axis = niceAxis(low, high)
      expect(axis.min).toBeLessThanOrEqual(low)
      expect(axis.max).toBeGreaterThanOrEqual(high)
      // Whole steps from zero, and a step whose first digit is 1, 2 or 5.
      for (const end of [axis.min, axis.max])
        expect(Math.abs(end / axis.interval - Math.round(end / axis.interval))).toBeLessThan(1e-9)
      expect(Number(axis.interval.toExponential().charAt(0))).toSatisfy((d: number) => [1, 2, 5].includes(d))
    }
  })

  it('starts years at the first year\'s decade, with few labels on round steps', () => {
    // [practice] an outlook from a 2020 epoch to 2150: no empty 2000–2020 stretch, labels every 50 years.
    const outlook = niceYearAxis(2020, 2150)
    expect(outlook).toEqual({ min: 2020, max: 2150, interval: 10, labelStep: 50 })
    const ticks = Array.from({ length: (outlook.max - outlook.min) / outlook.interval + 1 }, (_, i) => 2020 + i * 10)
    expect(ticks.map(yearAxisLabel(outlook)).filter(Boolean)).toEqual(['2020', '2050', '2100', '2150'])
    expect(niceYearAxis(2005, 2150)).toMatchObject({ min: 2000, max: 2150 })
    // 2040 to 2150 is labelled every 20 years; 2140 would crowd the last year, so it goes unlabelled.
    const late = niceYearAxis(2040, 2150)
    expect(late).toEqual({ min: 2040, max: 2150, interval: 10, labelStep: 20 })
    expect([2040, 2050, 2060, 2120, 2140, 2150].map(yearAxisLabel(late))).toEqual(['2040', '', '2060', '2120', '', '2150'])
    expect(niceYearAxis(2020, 2100)).toEqual({ min: 2020, max: 2100, interval: 10, labelStep: 20 })
  })

  it('survives a flat or empty range', () => {
    expect(niceAxis(0.5, 0.5).max).toBeGreaterThan(0.5)
    expect(niceAxis(Number.NaN, 1)).toEqual({ min: 0, max: 1, interval: 0.2 })
  })
})
