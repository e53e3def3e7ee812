import { describe, expect, it } from 'vitest'
import { finishOutlook, runBlocks } from '../../../shared/engine'
import { evaluateMeasures, measureChances, measuresPlan } from '../../../shared/pathways/evaluate-measures'
import { tippingFromCounts } from '../../../shared/pathways/tipping'
import { decisionSpread, decisionYear, pathwayDecisions } from '../../../shared/pathways/decisions'

// Linear rise from the epoch with a normal rate r ~ N(5, 1) mm/yr: one `normal` component whose mean
// and sd grow in proportion to the years since the epoch, so every trajectory is r·(t − epoch).
const EPOCH = 2020
const ANCHORS = [2070, 2120, 2170]
function linearRiseInput(samples: number) {
  const years = [EPOCH]
  for (let y = 2030; y <= 2170; y += 10) years.push(y)
  return {
    baselineYear: EPOCH, years, samples, seed: 7,
    components: [{ key: 'rate', scale: 1, release: {
      form: 'normal', baselineYear: EPOCH, anchorYears: ANCHORS,
      mean: ANCHORS.map(a => 0.005 * (a - EPOCH)), sd: ANCHORS.map(a => 0.001 * (a - EPOCH)),
    } }],
    heights: { from: 0, to: 1, step: 0.1 },
  }
}

describe('tipping years from the trajectories', () => {
  const evaluated = evaluateMeasures(
    linearRiseInput(200_000),
    [{ key: 'wall', height: 0.5, kind: 'mean-sea-level' }],
    [0.1, 0.5],
  )
  const tipping = evaluated.measures[0]!.tipping

  it('tips at tolerance 50 % at epoch + 100 years', () => {
    // [practice] the median rate is 5 mm/yr, so the median trajectory reaches 0.5 m after 0.5 / 0.005 = 100 years.
    const half = tipping.find(t => t.tolerance === 0.5)!
    expect(half.resolution).toBe('annual')
    expect(Math.abs(half.year! - (EPOCH + 100))).toBeLessThanOrEqual(1)
    expect(half.earliest!).toBeLessThanOrEqual(half.year!)
    expect(half.latest!).toBeGreaterThanOrEqual(half.year!)
  })

  it('tips at tolerance 10 % where the 90th-percentile rate reaches the height', () => {
    // [memory: standard normal table, Abramowitz & Stegun 26.2] z_0.9 = 1.2816, so r_0.9 = 5 + 1.2816 · 1
    // = 6.2816 mm/yr and P(rise > 0.5 m) reaches 10 % once t − epoch ≥ 0.5 / 0.0062816 = 79.6 years.
    const rate90 = 5 + 1.2816 * 1
    const analytic = EPOCH + Math.ceil(0.5 / (rate90 / 1000))
    const tenth = tipping.find(t => t.tolerance === 0.1)!
    expect(analytic).toBe(2100)
    expect(Math.abs(tenth.year! - analytic)).toBeLessThanOrEqual(1)
  })

  it('gives no tipping year when the height is not reached by the horizon', () => {
    const high = evaluateMeasures(linearRiseInput(20_000), [{ key: 'gate', height: 3, kind: 'mean-sea-level' }], [0.5])
    expect(high.horizon).toBe(2170)
    expect(high.measures[0]!.tipping[0]!.year).toBeNull()
  })
})

describe('flood-level tipping years at annual resolution', () => {
  // A deterministic rise r·t (a normal component with no spread) under Gumbel annual maxima with
  // location μ and scale λ: the annual chance of exceeding h in year t is
  // 1 − F(h − r·t) = 1 − exp(−exp(−(h − r·t − μ)/λ)), F the Gumbel CDF [pub: Gumbel 1958, Statistics of
  // Extremes, eq. 1.2.1; Coles 2001, An Introduction to Statistical Modeling of Extreme Values, eq. 3.3].
  // It reaches p once r·t ≥ h − μ + λ·ln(−ln(1 − p)): the tipping year is the first whole year past that.
  const rate = 0.0073
  const gumbel = { location: 1.1, scale: 0.13 }
  const height = 1.65
  function deterministicInput(extra: Record<string, unknown> = {}) {
    const input = linearRiseInput(2_000) as Record<string, unknown> & ReturnType<typeof linearRiseInput>
    input.components[0]!.release.mean = ANCHORS.map(a => rate * (a - EPOCH))
    input.components[0]!.release.sd = ANCHORS.map(() => 0)
    return { ...input, gumbel: { ...gumbel, returnPeriods: [100] }, ...extra }
  }
  const analytic = (p: number) =>
    EPOCH + Math.ceil((height - gumbel.location + gumbel.scale * Math.log(-Math.log(1 - p))) / rate)

  it('is the first year whose Gumbel exceedance reaches the tolerance, not an output year', () => {
    const tolerances = [0.05, 0.1, 0.33, 0.5]
    const evaluated = evaluateMeasures(deterministicInput(), [{ key: 'gate', height, kind: 'flood-level' }], tolerances)
    const tipping = evaluated.measures[0]!.tipping
    // [practice] (0.55 + 0.13·ln(−ln(1 − p))) / 0.0073 = 22.4, 35.3, 59.0, 68.8 years: none an output year.
    expect(tolerances.map(analytic)).toEqual([2043, 2056, 2080, 2089])
    for (const t of tipping) {
      expect(t.year).toBe(analytic(t.tolerance))
      // No spread, so no Monte Carlo interval either side.
      expect(t.earliest).toBe(t.year)
      expect(t.latest).toBe(t.year)
      expect(t.resolution).toBe('annual')
    }
  })

  it('agrees with the outlook\'s own annual chance at output years', () => {
    const input = { ...deterministicInput(), thresholds: [{ key: 'gate', height, kind: 'flood-level' }] }
    input.components[0]!.release.sd = ANCHORS.map(a => 0.001 * (a - EPOCH))
    const plan = measuresPlan(input, [{ key: 'gate', height, kind: 'flood-level' }])
    const merged = runBlocks(plan, 0, plan.blockCount)
    const annual = measureChances(plan, merged).measures[0]!.chances
    const outlook = finishOutlook(plan, merged).thresholds[0]!.flood!.annualChance
    plan.years.forEach((year, t) => {
      expect(annual.value[year - EPOCH]).toBeCloseTo(outlook[t]!.value, 12)
      expect(annual.se[year - EPOCH]).toBeCloseTo(outlook[t]!.se, 12)
    })
    // Between output years the chance grows year by year.
    for (let y = 1; y < annual.value.length; y++) expect(annual.value[y]!).toBeGreaterThanOrEqual(annual.value[y - 1]!)
  })
})

describe('the Monte Carlo interval of a tipping year', () => {
  it('spans the years whose chance is within 1.96 standard errors of the tolerance', () => {
    // [practice] with n = 10,000 a chance of 0.492 has SE √(0.492 · 0.508 / 10⁴) = 0.0050, so 0.492 + 1.96 SE = 0.5018
    // ≥ 0.5
    // while 0.51 − 1.96 SE = 0.5002 ≥ 0.5.
    const counts = [0, 4800, 4920, 5000, 5100, 5300]
    const t = tippingFromCounts(counts, 2050, 10_000, 0.5)
    expect(t).toEqual({ tolerance: 0.5, year: 2053, earliest: 2052, latest: 2054, resolution: 'annual' })
  })
})

describe('decision years', () => {
  it('is the tipping year less the lead time of the next measure', () => {
    // [practice] 2060 − 15 = 2045; decided in 2040 there is time, in 2046 there is not.
    expect(decisionYear(2060, 15, 2040)).toEqual({ decisionYear: 2045, alreadyLate: false })
    expect(decisionYear(2060, 15, 2046)).toEqual({ decisionYear: 2045, alreadyLate: true })
    expect(decisionYear(null, 15, 2046)).toEqual({ decisionYear: null, alreadyLate: false })
  })

  it('gives the spread across scenarios as earliest and latest decision year', () => {
    const tip = (year: number | null) => [
      { tolerance: 0.5, year, earliest: year, latest: year, resolution: 'annual' as const },
    ]
    const scenarios = [
      { scenario: 'SSP1-2.6', horizon: 2150, tipping: { a: tip(2081), b: tip(null) } },
      { scenario: 'SSP5-8.5', horizon: 2150, tipping: { a: tip(2059), b: tip(2090) } },
      { scenario: 'SSP2-4.5', horizon: 2150, tipping: { a: tip(2070), b: tip(2120) } },
    ]
    const steps = [
      { measureId: 'a', leadTimeYears: 0 },
      { measureId: 'b', leadTimeYears: 18 },
      { measureId: 'c', leadTimeYears: 30 },
    ]
    const decisions = pathwayDecisions(steps, scenarios, [0.5], 2045)
    const spread = decisionSpread(decisions)
    // [practice] 2059 − 18 = 2041 (SSP5-8.5) to 2081 − 18 = 2063 (SSP1-2.6).
    expect(spread[0]).toMatchObject({
      toMeasureId: 'b',
      earliest: { year: 2041, scenario: 'SSP5-8.5' },
      latest: { year: 2063, scenario: 'SSP1-2.6' },
      alreadyLate: true,
    })
    // [practice] 2090 − 30 = 2060, 2120 − 30 = 2090; SSP1-2.6 does not tip b by 2150.
    expect(spread[1]).toMatchObject({
      toMeasureId: 'c',
      earliest: { year: 2060, scenario: 'SSP5-8.5' },
      latest: { year: 2090, scenario: 'SSP2-4.5' },
      notWithinHorizon: [{ scenario: 'SSP1-2.6', horizon: 2150 }],
      alreadyLate: false,
    })
  })
})
