import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { runOutlook, type OutlookInput } from '../../../shared/engine'
import { allNumbers } from './helpers'

// Random small outlooks: a quantile release and a normal release, correlated, with land motion.
const outlookArbitrary = fc
  .record({
    seed: fc.integer({ min: 0, max: 2 ** 31 }),
    rho: fc.double({ min: -0.95, max: 0.95, noNaN: true }),
    medians: fc.array(fc.double({ min: -0.2, max: 1, noNaN: true }), { minLength: 2, maxLength: 2 }),
    spreads: fc.array(fc.double({ min: 0, max: 0.5, noNaN: true }), { minLength: 4, maxLength: 4 }),
    sd: fc.double({ min: 0, max: 0.3, noNaN: true }),
    rate: fc.double({ min: -10, max: 10, noNaN: true }),
    rateSigma: fc.double({ min: 0, max: 2, noNaN: true }),
    thresholds: fc.array(fc.double({ min: -0.5, max: 2, noNaN: true }), { minLength: 2, maxLength: 4 }),
  })
  .map(({ seed, rho, medians, spreads, sd, rate, rateSigma, thresholds }): OutlookInput => {
    const row = (median: number) => [
      median - spreads[0]! - spreads[1]!,
      median - spreads[1]!,
      median,
      median + spreads[2]!,
      median + spreads[2]! + spreads[3]!,
    ]
    return {
      baselineYear: 2020,
      years: [2020, 2040, 2060, 2080, 2100],
      samples: 3000,
      seed,
      components: [
        {
          key: 'antarctica',
          release: {
            form: 'quantiles',
            baselineYear: 2020,
            anchorYears: [2060, 2100],
            levels: [0.05, 0.17, 0.5, 0.83, 0.95],
            values: [row(medians[0]! / 2), row(medians[0]!)],
          },
        },
        {
          key: 'ocean-expansion',
          release: { form: 'normal', baselineYear: 2020, anchorYears: [2100], mean: [medians[1]!], sd: [sd] },
        },
      ],
      correlation: [
        [1, rho],
        [rho, 1],
      ],
      landMotion: { rateMmPerYear: rate, sigmaMmPerYear: rateSigma, epoch: 2020 },
      heights: { from: -0.5, to: 2.5, step: 0.1 },
      thresholds: thresholds.map(height => ({ height })),
    }
  })

const RUNS = { numRuns: 25 }

describe('outlook properties', () => {
  it('exceedance never rises with height, percentiles are ordered, probabilities stay in [0, 1], no NaN', () => {
    fc.assert(
      fc.property(outlookArbitrary, (input) => {
        const result = runOutlook(input)
        expect(allNumbers(result).some(Number.isNaN)).toBe(false)
        for (const year of result.byYear) {
          for (let h = 1; h < year.exceedance.length; h++)
            expect(year.exceedance[h]!.value).toBeLessThanOrEqual(year.exceedance[h - 1]!.value)
          for (let q = 1; q < year.percentiles.length; q++)
            expect(year.percentiles[q]!.value).toBeGreaterThanOrEqual(year.percentiles[q - 1]!.value)
          for (const e of year.exceedance) expect(e.value >= 0 && e.value <= 1).toBe(true)
        }
      }),
      RUNS,
    )
  })

  it('variance shares sum to one wherever the rise has spread', () => {
    fc.assert(
      fc.property(outlookArbitrary, (input) => {
        for (const year of runOutlook(input).byYear) {
          if (year.varianceShare === null) {
            expect(year.sd).toBeLessThan(1e-11)
            continue
          }
          const total = Object.values(year.varianceShare).reduce((a, b) => a + b, 0)
          expect(total).toBeCloseTo(1, 8)
        }
      }),
      RUNS,
    )
  })

  it('the same seed gives the same bits', () => {
    fc.assert(
      fc.property(outlookArbitrary, (input) => {
        const bytes = () => Buffer.from(Float64Array.from(allNumbers(runOutlook(input))).buffer)
        expect(bytes().equals(bytes())).toBe(true)
      }),
      { numRuns: 10 },
    )
  })

  it('a lower tolerance never triggers later, a higher threshold never triggers earlier', () => {
    fc.assert(
      fc.property(outlookArbitrary, (input) => {
        const result = runOutlook(input)
        const order = (year: number | null) => (year === null ? Infinity : year)
        for (const threshold of result.thresholds) {
          const byTolerance = [...threshold.triggerYears].sort((a, b) => a.tolerance - b.tolerance)
          for (let k = 1; k < byTolerance.length; k++)
            expect(order(byTolerance[k - 1]!.year)).toBeLessThanOrEqual(order(byTolerance[k]!.year))
        }
        const byHeight = [...result.thresholds].sort((a, b) => a.height - b.height)
        for (let k = 1; k < byHeight.length; k++) {
          byHeight[k]!.triggerYears.forEach((trigger, j) => {
            expect(order(trigger.year)).toBeGreaterThanOrEqual(order(byHeight[k - 1]!.triggerYears[j]!.year))
          })
        }
      }),
      RUNS,
    )
  })

  it('more sinking never lowers an exceedance probability, and rise at the baseline year is zero', () => {
    fc.assert(
      fc.property(outlookArbitrary, fc.double({ min: 0.1, max: 5, noNaN: true }), (input, extraSinking) => {
        const base = runOutlook(input)
        const sinking = runOutlook({
          ...input,
          landMotion: { ...input.landMotion!, rateMmPerYear: input.landMotion!.rateMmPerYear! - extraSinking },
        })
        base.byYear.forEach((year, t) => {
          year.exceedance.forEach((e, h) =>
            expect(sinking.byYear[t]!.exceedance[h]!.value).toBeGreaterThanOrEqual(e.value),
          )
        })
        expect(base.byYear[0]!.mean.value).toBe(0)
        expect(base.byYear[0]!.sd).toBe(0)
      }),
      RUNS,
    )
  })

  it('a higher scale factor on a non-negative component never lowers exceedance', () => {
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 1000 }), fc.double({ min: 1, max: 1.5, noNaN: true }), (seed, scale) => {
        const input = (s: number): OutlookInput => ({
          baselineYear: 2020,
          years: [2100],
          samples: 2000,
          seed,
          components: [
            {
              key: 'greenland',
              scale: s,
              release: {
                form: 'quantiles',
                baselineYear: 2020,
                anchorYears: [2100],
                levels: [0.05, 0.5, 0.95],
                values: [[0.01, 0.1, 0.3]],
              },
            },
          ],
          heights: { from: 0, to: 0.5, step: 0.05 },
        })
        const low = runOutlook(input(1)).byYear[0]!.exceedance
        const high = runOutlook(input(scale)).byYear[0]!.exceedance
        low.forEach((e, h) => expect(high[h]!.value).toBeGreaterThanOrEqual(e.value))
      }),
      { numRuns: 15 },
    )
  })
})
