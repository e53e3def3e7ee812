import { describe, expect, it } from 'vitest'
import { runOutlook } from '../../../shared/engine'
import type { ComponentInput } from '../../../shared/engine'
import { baseInput, normalComponent } from './helpers'

const decades = Array.from({ length: 14 }, (_, k) => 2020 + 10 * k)

function trigger(result: ReturnType<typeof runOutlook>, tolerance: number): number | null {
  return result.thresholds[0]!.triggerYears.find(entry => entry.tolerance === tolerance)!.year
}

describe('trigger years at annual resolution', () => {
  it('finds the crossing year of a linear rise, not the next output year', () => {
    // [practice, CHECKS.md "Annual-resolution trigger"] 5.1 mm/yr from 2020 reaches 0.5 m after
    // 0.5 / 0.0051 = 98.04 years: 2118 is below (0.4998 m), 2119 above (0.5049 m).
    const result = runOutlook(
      baseInput({
        baselineYear: 2020,
        years: decades,
        samples: 4096,
        components: [normalComponent('ocean-expansion', { 2150: [0.0051 * 130, 1e-6] }, 2020)],
        thresholds: [{ height: 0.5 }],
      }),
    )
    for (const tolerance of result.tolerances) expect(trigger(result, tolerance)).toBe(2119)
  })

  it('places a 10 % trigger of an uncertain rate where the normal quantile says', () => {
    // [practice, CHECKS.md] rate ~ N(5, 1) mm/yr: P(rise > 0.5 m after n years) = 1 − Φ(500/n − 5).
    // n = 79 gives 0.092, n = 80 gives 0.106 (z₀.₉ = 1.2816 → 79.6 years): the first year whose chance
    // reaches 10 % is 2020 + 80 = 2100. Both sides are over 4 Monte Carlo SE (0.0013 at 50k) from 10 %.
    const result = runOutlook(
      baseInput({
        baselineYear: 2020,
        years: decades,
        samples: 50_000,
        components: [normalComponent('ocean-expansion', { 2150: [0, 0] }, 2020)],
        landMotion: { rateMmPerYear: -5, sigmaMmPerYear: 1, epoch: 2020 },
        thresholds: [{ height: 0.5 }],
      }),
    )
    expect(trigger(result, 0.1)).toBe(2100)
  })

  const draws: ComponentInput = {
    key: 'antarctica',
    scale: 1.2,
    release: {
      form: 'samples',
      baselineYear: 1995,
      anchorYears: [2050, 2100],
      draws: Array.from({ length: 40 }, (_, k) => [0.002 * k, 0.006 * k]),
    },
  }
  const lognormal: ComponentInput = {
    key: 'greenland',
    scale: 1,
    release: {
      form: 'lognormal',
      baselineYear: 2000,
      anchorYears: [2070, 2100],
      shift: [0, 0],
      mu: [-3, -2.5],
      sigma: [0.4, 0.5],
    },
  }
  it.each([
    ['a normal release', []],
    ['uploaded draws and a lognormal release', [draws, lognormal]],
  ])(
    'is never later than the output year that reaches the tolerance, and agrees with annual output years (%s)',
    (_, extra) => {
      const input = baseInput({
        baselineYear: 2000,
        years: [2030, 2060, 2100],
        components: [
          normalComponent('ocean-expansion', { 2050: [0.1, 0.03], 2100: [0.3, 0.08] }),
          ...(extra as ComponentInput[]),
        ],
        landMotion: { rateMmPerYear: -1, sigmaMmPerYear: 0.5, epoch: 2000 },
        thresholds: [{ height: 0.1 }, { height: 0.25 }],
      })
      const coarse = runOutlook(input)
      const annualYears = Array.from({ length: 100 }, (_, k) => 2001 + k)
      const fine = runOutlook({ ...input, years: annualYears })
      coarse.thresholds.forEach((threshold, m) => {
        threshold.triggerYears.forEach(({ tolerance, year }, k) => {
          // [practice] same samples: counting every calendar year between knots gives what annual output years give.
          expect(year).toBe(fine.thresholds[m]!.triggerYears[k]!.year)
          const decadal = coarse.years.find((y, t) => threshold.byYear[t]!.value >= tolerance) ?? null
          if (decadal !== null) expect(year).not.toBeNull()
          if (decadal !== null && year !== null) expect(year).toBeLessThanOrEqual(decadal)
        })
      })
    },
  )
})
