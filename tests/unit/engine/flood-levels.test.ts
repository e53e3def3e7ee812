import { afterEach, describe, expect, it, vi } from 'vitest'
import {
  BLOCK_SIZE,
  finishOutlook,
  gumbelReturnLevel,
  mergePartials,
  planOutlook,
  runBlocks,
  runOutlook,
  standardNormalCdf,
  type OutlookInput,
  type ThresholdInput,
} from '../../../shared/engine'
import { baseInput, normalComponent } from './helpers'

const gumbel = { location: 1, scale: 0.1 }

/** An outlook from 2000 with one normal component; `anchors` as in `normalComponent`. */
function outlook(
  anchors: Record<number, [number, number]>,
  thresholds: ThresholdInput[],
  extra: Partial<OutlookInput> = {},
) {
  return runOutlook(
    baseInput({
      years: [2000, 2050, 2100],
      samples: 20_000,
      components: [normalComponent('other', anchors)],
      gumbel,
      thresholds,
      ...extra,
    }),
  )
}

/** Chance of no exceedance of h by the annual maxima in years first … last, with a known rise per year. */
function noneDuring(height: number, rise: (year: number) => number, first: number, last: number): number {
  let none = 1
  for (let year = first; year <= last; year++)
    none *= Math.exp(-Math.exp(-(height - rise(year) - gumbel.location) / gumbel.scale))
  return none
}

/** E[f(x)] for x ~ N(mean, sd²), by the midpoint rule over ±8 sd. */
function normalExpectation(f: (x: number) => number, mean: number, sd: number): number {
  const steps = 4000
  let total = 0
  for (let k = 0; k < steps; k++) {
    const z = -8 + (16 * (k + 0.5)) / steps
    total += f(mean + sd * z) * Math.exp(-z * z / 2) * (16 / steps)
  }
  return total / Math.sqrt(2 * Math.PI)
}

describe('flood levels over a design life', () => {
  const level100 = gumbelReturnLevel(gumbel, 100)

  it('without rise, gives 1 − 0.99^50 for today’s 100-year level over 50 years and that level back as the design-life level', () => {
    const chance = 1 - 0.99 ** 50
    const result = outlook({ 2100: [0, 0] }, [
      { kind: 'flood-level', height: level100, designLifeYears: 50, lifeStartYear: 2030, designLifeChance: chance },
    ])
    const threshold = result.thresholds[0]!
    // [practice] CHECKS.md design life: T = 100, L = 50 → 1 − (1 − 1/100)^50 = 0.395
    expect(threshold.lifeExceedance!.value).toBeCloseTo(0.395, 3)
    expect(threshold.lifeExceedance!.value).toBeCloseTo(chance, 12)
    // [practice] CHECKS.md: the T-year level is μ + 4.6001 λ for T = 100; with no rise, the level with
    // chance 1 − (1 − 1/T)^L over L years is the T-year level (design-life level, Rootzén & Katz 2013, WRR)
    expect(threshold.designLifeLevel!.chance).toBe(chance)
    expect(threshold.designLifeLevel!.level).toBeCloseTo(gumbel.location + 4.6001 * gumbel.scale, 4)
  })

  it('with a fixed rise, the design-life level solves Π F(h − rise) = 1 − chance to a tenth of a millimetre', () => {
    // [practice] arithmetic: exp(−e^{−(h−μ)/λ} Σ_years e^{rise/λ}) = 1 − p gives
    // h = μ + λ(ln Σ_years e^{rise/λ} − ln(−ln(1 − p))); rise 0.004 m a year from 2000, life 2040–2089.
    const rise = (year: number) => 0.004 * (year - 2000)
    let sum = 0
    for (let year = 2040; year <= 2089; year++) sum += Math.exp(rise(year) / gumbel.scale)
    const level = gumbel.location + gumbel.scale * (Math.log(sum) - Math.log(-Math.log(0.9)))
    const result = outlook({ 2050: [0.2, 0], 2100: [0.4, 0] }, [
      { kind: 'flood-level', height: 1.5, designLifeYears: 50, lifeStartYear: 2040 },
    ])
    const designLevel = result.thresholds[0]!.designLifeLevel!
    expect(designLevel.chance).toBe(0.1)
    expect(Math.abs(designLevel.level - level)).toBeLessThan(1e-4)
  })

  it('with an uncertain rise, the design-life level is exceeded during the life with the chosen chance', () => {
    // [pub] Rootzén & Katz (2013), WRR: the design-life level is the height whose chance of at least one
    // exceedance during the life is the chosen chance; the same samples (same seed) at that height must say so.
    const anchors: Record<number, [number, number]> = { 2050: [0.2, 0.05], 2100: [0.5, 0.15] }
    const life = { kind: 'flood-level' as const, designLifeYears: 40, lifeStartYear: 2045, designLifeChance: 0.2 }
    const level = outlook(anchors, [{ ...life, height: 1.5 }]).thresholds[0]!.designLifeLevel!.level
    const atLevel = outlook(anchors, [{ ...life, height: level }]).thresholds[0]!.lifeExceedance!
    expect(Math.abs(atLevel.value - 0.2)).toBeLessThan(1e-3)
  })

  it('counts exactly the years of the life, wherever it starts among the output years', () => {
    // [practice] independent annual maxima: P(none) = Π_years F(h − rise_year), rise piecewise linear
    // through 0 (2000), 0.1 m (2050) and 0.4 m (2100), the outlook's knots.
    const rise = (year: number) => (year <= 2050 ? 0.1 * (year - 2000) / 50 : 0.1 + 0.3 * (year - 2050) / 50)
    const lives: Array<[number, number]> = [[2000, 1], [2000, 30], [2040, 20], [2050, 1], [2051, 50], [2100, 1]]
    const result = outlook(
      { 2050: [0.1, 0], 2100: [0.4, 0] },
      lives.map(([lifeStartYear, designLifeYears]) => ({
        kind: 'flood-level',
        height: level100,
        lifeStartYear,
        designLifeYears,
      })),
      { samples: 100 },
    )
    lives.forEach(([start, years], k) => {
      const threshold = result.thresholds[k]!
      expect(threshold.lifeStartYear).toBe(start)
      expect(threshold.designLifeYears).toBe(years)
      expect(threshold.lifeExceedance!.value).toBeCloseTo(1 - noneDuring(level100, rise, start, start + years - 1), 10)
    })
  })

  it('on a rising sea, gives a later life a larger chance than an earlier one of the same length', () => {
    const result = outlook({ 2050: [0.2, 0.05], 2100: [0.5, 0.15] }, [
      { key: 'early', kind: 'flood-level', height: level100, designLifeYears: 30, lifeStartYear: 2030 },
      { key: 'late', kind: 'flood-level', height: level100, designLifeYears: 30, lifeStartYear: 2060 },
    ])
    const [early, late] = result.thresholds.map(threshold => threshold.lifeExceedance!)
    // [practice] with no rise both would be 1 − 0.99^30 = 26.0 % (CHECKS.md); a higher sea only adds.
    expect(early!.value).toBeGreaterThan(0.26)
    expect(late!.value).toBeGreaterThan(early!.value + 4 * (early!.se + late!.se))
    expect(result.thresholds[1]!.designLifeLevel!.level).toBeGreaterThan(result.thresholds[0]!.designLifeLevel!.level)
  })
})

describe('a flood level against a mean-sea-level threshold at the same height', () => {
  // Annual maxima around μ = 2.2 m reach 2.30 m often; the mean sea level (rise ~0.3 m by 2100) never does.
  const location = 2.2
  const scale = 0.1
  const result = runOutlook(
    baseInput({
      years: [2050, 2100],
      samples: 20_000,
      components: [normalComponent('other', { 2050: [0.1, 0.03], 2100: [0.3, 0.1] })],
      gumbel: { location, scale },
      thresholds: [
        { key: 'crest', kind: 'flood-level', height: 2.3 },
        { key: 'crest-as-msl', kind: 'mean-sea-level', height: 2.3 },
      ],
    }),
  )
  const [flood, meanSea] = result.thresholds

  it('words the flood level from the total water level only', () => {
    expect(flood!.kind).toBe('flood-level')
    expect(flood!.byYear).toEqual([])
    expect(flood!.triggerYears).toEqual([])
    expect(flood!.flood).not.toBeNull()
    expect(flood!.lifeExceedance).toBeNull()
    expect(flood!.designLifeLevel).toBeNull()
    expect(meanSea!.flood).toBeNull()
    expect(meanSea!.byYear.every(estimate => estimate.value === 0)).toBe(true)
  })

  it('gives the annual chance E[1 − F(h − rise)] over the rise’s distribution', () => {
    // [practice] numerical integration of 1 − exp(−exp(−(h − rise − μ)/λ)) over the normal rise
    const expected = normalExpectation(rise => -Math.expm1(-Math.exp(-(2.3 - rise - location) / scale)), 0.3, 0.1)
    const chance = flood!.flood!.annualChance[1]!
    expect(expected).toBeGreaterThan(0.9)
    expect(Math.abs(chance.value - expected)).toBeLessThan(4 * chance.se + 1e-4)
    expect(flood!.flood!.returnPeriodYears[1]).toBeCloseTo(1 / chance.value, 12)
  })

  it('gives the expected exceedances a year e^{−(h−μ)/λ}·E[e^{rise/λ}]', () => {
    // [practice] the mean of a lognormal: E[e^{rise/λ}] = exp(m/λ + s²/(2λ²)) for rise ~ N(m, s²)
    const expected = Math.exp(-(2.3 - location) / scale) * Math.exp(0.3 / scale + 0.1 ** 2 / (2 * scale ** 2))
    expect(flood!.flood!.expectedPerYear[1]! / expected).toBeCloseTo(1, 1)
  })
})

describe('flood levels far from the sea', () => {
  it('saturates at 0 and 1, with no return period where the chance is 0', () => {
    // [practice] F(z) = exp(−exp(−(z − μ)/λ)) with λ = 0.1 m: 1 − F is about e^{−990}, 0 in doubles, at 99 m
    // above μ, and 1 at 101 m below it (exponents past ±300 take the engine's direct form, not the factored one).
    const result = outlook({ 2050: [0.2, 0.05], 2100: [0.5, 0.15] }, [
      { kind: 'flood-level', height: 100 },
      { kind: 'flood-level', height: -100 },
    ])
    const [high, low] = result.thresholds.map(threshold => threshold.flood!)
    expect(high!.annualChance[2]!.value).toBe(0)
    expect(high!.returnPeriodYears[2]).toBeNull()
    expect(low!.annualChance[2]!.value).toBe(1)
    expect(low!.returnPeriodYears[2]).toBe(1)
    // [practice: rule of three, −ln 0.05 ≈ 3] an averaged chance of exactly 0 is said as "below 3/N",
    // not "0 ± 0"; one of exactly 1 as "above 1 − 3/N".
    expect(high!.annualChance[2]!.upperBound95).toBe(3 / 20_000)
    expect(low!.annualChance[2]!.lowerBound95).toBe(1 - 3 / 20_000)
    expect(high!.annualChance[2]!.lowerBound95).toBeUndefined()
  })

  it('bounds a life chance of 0 by the rule of three', () => {
    // [practice] 40 years of a level 99 m above the Gumbel location: no sample's chance differs from 0.
    const result = outlook({ 2050: [0.2, 0.05], 2100: [0.5, 0.15] }, [
      { kind: 'flood-level', height: 100, designLifeYears: 40, lifeStartYear: 2040 },
    ])
    const life = result.thresholds[0]!.lifeExceedance!
    expect(life.value).toBe(0)
    expect(life.upperBound95).toBe(3 / 20_000)
  })
})

describe('standard errors of averaged chances', () => {
  const thresholds: ThresholdInput[] = [{ kind: 'flood-level', height: 1.5, designLifeYears: 40, lifeStartYear: 2040 }]
  const estimates = (result: ReturnType<typeof runOutlook>) => ({
    annual: result.thresholds[0]!.flood!.annualChance[2]!,
    life: result.thresholds[0]!.lifeExceedance!,
    hundredYear: result.byYear[2]!.gumbel!.returnPeriods.find(period => period.today === 100)!.annualChance,
  })

  it('are 0 when the rise is fixed', () => {
    // [practice] the mean of N equal values has no Monte Carlo error
    const fixed = estimates(outlook({ 2050: [0.2, 0], 2100: [0.5, 0] }, thresholds, { samples: 5000 }))
    for (const estimate of Object.values(fixed)) {
      expect(estimate.value).toBeGreaterThan(0)
      expect(estimate.se).toBe(0)
    }
  })

  it('are within 20 % of the spread of the estimates over 200 seeds (normal rise)', () => {
    // [practice; issue check] with 200 independent seeds the sample sd of the estimates is within about
    // ±5 % (1/√(2·199)) of the true Monte Carlo error, so a correct SE lands well within 20 % of it.
    const samples = 1000
    const runs = Array.from({ length: 200 }, (_, seed) =>
      estimates(outlook({ 2050: [0.2, 0.05], 2100: [0.5, 0.15] }, thresholds, { samples, seed: 1000 + seed })),
    )
    for (const which of ['annual', 'life'] as const) {
      const values = runs.map(run => run[which].value)
      const mean = values.reduce((a, b) => a + b, 0) / values.length
      const sd = Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1))
      const reported = runs.reduce((a, run) => a + run[which].se, 0) / runs.length
      expect(Math.abs(reported / sd - 1), which).toBeLessThan(0.2)
    }
  })

  it('match the spread of the estimates over 30 seeds, and stay below the binomial √(p(1−p)/N)', () => {
    // [practice] the standard error of a mean of N per-sample chances is √(Var(p_s)/N); over independent
    // seeds the estimates spread by that much (30 seeds: the sd is within ±40 % of it with high probability).
    // A chance lies in [0, 1], so Var(p_s) ≤ p(1 − p): the binomial formula is an upper bound.
    const samples = 2000
    const runs = Array.from({ length: 30 }, (_, seed) =>
      estimates(outlook({ 2050: [0.2, 0.05], 2100: [0.5, 0.15] }, thresholds, { samples, seed })),
    )
    for (const which of ['annual', 'life', 'hundredYear'] as const) {
      const values = runs.map(run => run[which].value)
      const mean = values.reduce((a, b) => a + b, 0) / values.length
      const sd = Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1))
      const reported = runs.reduce((a, run) => a + run[which].se, 0) / runs.length
      expect(sd / reported, which).toBeGreaterThan(1 / 1.5)
      expect(sd / reported, which).toBeLessThan(1.5)
      expect(reported, which).toBeLessThan(Math.sqrt((mean * (1 - mean)) / samples))
    }
  })
})

describe('inputs only', () => {
  it('gives the same bits however blocks are split, life histograms included', () => {
    // [practice] counts add exactly and block sums are added in block order (engine README, reproducibility)
    const plan = planOutlook(
      baseInput({
        years: [2050, 2100],
        samples: 4 * BLOCK_SIZE + 11,
        components: [normalComponent('other', { 2050: [0.2, 0.05], 2100: [0.5, 0.15] })],
        gumbel,
        thresholds: [{ kind: 'flood-level', height: 1.5, designLifeYears: 40, lifeStartYear: 2040 }],
      }),
    )
    const whole = runBlocks(plan, 0, plan.blockCount)
    const merged = mergePartials(plan, [runBlocks(plan, 3, 2), runBlocks(plan, 0, 3)])
    expect(Array.from(merged.lifeHistogram)).toEqual(Array.from(whole.lifeHistogram))
    expect(JSON.stringify(finishOutlook(plan, merged))).toBe(JSON.stringify(finishOutlook(plan, whole)))
  })

  afterEach(() => {
    vi.useRealTimers()
  })

  it('gives identical results for the same input, whatever the date', () => {
    // [practice] CHECKS.md: results never depend on the year they are computed in
    const input = baseInput({
      years: [2030, 2050, 2100],
      samples: 3000,
      landMotion: { rateMmPerYear: -2, sigmaMmPerYear: 0.5, epoch: 2005 },
      gumbel,
      thresholds: [
        { height: 0.3 },
        { kind: 'flood-level', height: 1.4, designLifeYears: 50, lifeStartYear: 2035 },
      ],
    })
    const first = JSON.stringify(runOutlook(input))
    vi.useFakeTimers()
    vi.setSystemTime(new Date('2091-07-01T00:00:00Z'))
    expect(JSON.stringify(runOutlook(input))).toBe(first)
  })
})

describe('normal expectation helper', () => {
  it('integrates the normal cdf', () => {
    // [practice] E[Φ(x)] for x ~ N(0, 1) is 1/2 by symmetry
    expect(normalExpectation(x => standardNormalCdf(x), 0, 1)).toBeCloseTo(0.5, 8)
  })
})
