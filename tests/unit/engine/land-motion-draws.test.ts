import { describe, expect, it } from 'vitest'
import { EngineInputError, runOutlook, standardNormalQuantile, type OutlookInput } from '../../../shared/engine'
import { baseInput, normalComponent } from './helpers'

// Land motion given as posterior draws of its rate, checked against closed forms. Baseline 2000, output
// years 2050 and 2100: a rate r mm/yr adds −r/1000 · (t − 2000) m, so −r/10 m by 2100.

const N = 20_000
const percentile = (result: ReturnType<typeof runOutlook>, t: number, level: number) =>
  result.byYear[t]!.percentiles.find(p => p.level === level)!

/** A component with no spread: the rise is land motion's alone, plus 0.5 m by 2100. */
const fixedComponent = normalComponent('ocean', { 2050: [0.25, 0], 2100: [0.5, 0] })

function issuesOf(input: OutlookInput): string[] {
  try {
    runOutlook(input)
  }
  catch (error) {
    if (error instanceof EngineInputError) return error.issues.map(issue => `${issue.path}: ${issue.message}`)
    throw error
  }
  return []
}

describe('land-motion draws picked by the land-motion score', () => {
  it('gives the normal form\'s percentiles when the draws are a normal\'s quantiles', () => {
    // Draws at the mid-point quantiles μ + σ·Φ⁻¹((j + ½)/n) of N(3, 2²) mm/yr (Φ⁻¹: Wichura's AS 241).
    // Rank ⌊Φ(z)·n⌋ then picks within one spacing of μ + σz, so the two forms agree to Monte Carlo
    // error, and both match the closed forms: mean 0.5 − 0.3 = 0.2 m and sd √(0.08² + 0.2²) m in 2100.
    const n = 10_000
    const draws = Array.from({ length: n }, (_, j) => 3 + 2 * standardNormalQuantile((j + 0.5) / n))
    const component = normalComponent('ocean', { 2050: [0.2, 0.04], 2100: [0.5, 0.08] })
    const landMotion = { rateMmPerYear: 3, sigmaMmPerYear: 2, epoch: 2000 }
    const normal = runOutlook(baseInput({ samples: N, components: [component], landMotion }))
    const drawn = runOutlook(baseInput({ samples: N, components: [component], landMotion: { draws, epoch: 2000 } }))
    for (const level of [0.05, 0.17, 0.5, 0.83, 0.95]) {
      expect(percentile(drawn, 1, level).value).toBeCloseTo(percentile(normal, 1, level).value, 2)
    }
    const sd = Math.hypot(0.08, 0.2)
    expect(Math.abs(drawn.byYear[1]!.mean.value - 0.2)).toBeLessThan(4 * sd / Math.sqrt(N))
    expect(drawn.byYear[1]!.sd).toBeCloseTo(sd, 2)
    const shares = drawn.byYear[1]!.varianceShare!
    expect(shares['land-motion']).toBeCloseTo(0.2 ** 2 / sd ** 2, 1)
  })

  it('gives a uniform set\'s analytic percentiles and chances (heavy skew carried in full)', () => {
    // Rates (j + ½)/n · 10 mm/yr, j = 0…n−1: uniform on [0, 10], so the rise in 2100, 0.5 − rate/10, is
    // uniform on [−0.5, 0.5]: percentile p at −0.5 + p, P(rise > h) = 0.5 − h, mean 0, sd 1/√12.
    const n = 1000
    const draws = Array.from({ length: n }, (_, j) => ((j + 0.5) / n) * 10)
    const result = runOutlook(baseInput({
      samples: N,
      components: [fixedComponent],
      landMotion: { draws, epoch: 2000 },
      heights: [-0.3, 0, 0.2, 0.4],
    }))
    const year = result.byYear[1]!
    for (const level of [0.05, 0.17, 0.5, 0.83, 0.95]) {
      const se = Math.sqrt((level * (1 - level)) / N)
      expect(Math.abs(percentile(result, 1, level).value - (-0.5 + level))).toBeLessThan(4 * se + 0.002)
    }
    ;[-0.3, 0, 0.2, 0.4].forEach((h, k) => {
      const p = 0.5 - h
      expect(Math.abs(year.exceedance[k]!.value - p)).toBeLessThan(4 * Math.sqrt((p * (1 - p)) / N))
    })
    expect(Math.abs(year.mean.value)).toBeLessThan(4 / Math.sqrt(12 * N))
    expect(year.sd).toBeCloseTo(1 / Math.sqrt(12), 2)
  })

  it('gives a two-point set\'s two rises and no others, each half the time', () => {
    // Rates 0 and 10 mm/yr: rank ⌊Φ(z)·2⌋ is 0 for z < 0 and 1 otherwise, so the rise in 2100 is 0.5 or
    // −0.5 m with chance ½ each (binomial SE √(¼/N)); the histogram's bounds are the two rises, read to a 1 mm bin.
    const landMotion = { draws: [10, 0], epoch: 2000 }
    const result = runOutlook(baseInput({ samples: N, components: [fixedComponent], landMotion, heights: [0] }))
    const year = result.byYear[1]!
    expect(Math.abs(year.exceedance[0]!.value - 0.5)).toBeLessThan(4 * Math.sqrt(0.25 / N))
    expect(percentile(result, 1, 0.05).value).toBeCloseTo(-0.5, 3)
    expect(percentile(result, 1, 0.95).value).toBeCloseTo(0.5, 3)
    expect(year.sd).toBeCloseTo(0.5, 2)
  })

  it('gives exactly the normal form\'s outlook when no draws are given', () => {
    const landMotion = { rateMmPerYear: 2, sigmaMmPerYear: 1, epoch: 1990 }
    const a = runOutlook(baseInput({ landMotion }))
    const b = runOutlook(baseInput({ landMotion: { ...landMotion, draws: undefined } }))
    expect(JSON.stringify(b)).toBe(JSON.stringify(a))
  })
})

describe('land-motion draws joint with a release\'s draws', () => {
  // Release draw j reaches x_j by 2100 (linear from 2000); land draw j is (x_j − 0.2)·10 mm/yr, so every
  // joint pair gives the same rise, 0.2·(t − 2000)/100 m. The release draws are uploaded out of order, so
  // a link that followed the ranked position instead of the upload index would mix the pairs.
  const n = 500
  const order = Array.from({ length: n }, (_, j) => (j * 7919) % n)
  const x = order.map(k => 0.1 + k * 0.002)
  const jointInput = (landMotion: OutlookInput['landMotion']): OutlookInput => baseInput({
    samples: 8192,
    components: [{ key: 'ice', release: { form: 'samples', baselineYear: 2000, anchorYears: [2100], draws: x.map(v => [v]) } }],
    landMotion,
    thresholds: [{ height: 0.149 }],
    heights: [0.1, 0.2],
    gumbel: { location: 1, scale: 0.1 },
  })
  const land = x.map(v => (v - 0.2) * 10)

  it('keeps each pair together: every trajectory has the same rise', () => {
    const result = runOutlook(jointInput({ draws: land, jointWith: 'ice', epoch: 2000 }))
    const year = result.byYear[1]!
    expect(year.sd).toBeLessThan(1e-9)
    expect(year.mean.value).toBeCloseTo(0.2, 9)
    expect(percentile(result, 1, 0.01).value).toBeCloseTo(0.2, 3)
    expect(percentile(result, 1, 0.99).value).toBeCloseTo(0.2, 3)
    // A constant rise: the allowance is the rise itself (λ·ln e^{rise/λ}), with no Monte Carlo error.
    expect(year.gumbel!.allowance).toBeCloseTo(0.2, 9)
    // Rise 0.2·(t − 2000)/100 first passes 0.149 m in 2075 (0.15 m), in every trajectory.
    for (const trigger of result.thresholds[0]!.triggerYears) expect(trigger.year).toBe(2075)
  })

  it('spreads the rise when the same draws are independent', () => {
    const result = runOutlook(jointInput({ draws: land, epoch: 2000 }))
    // Independent: Var = Var(x) + Var(land/10) with both uniform over 1 m·(n − 1)/n ranges: ≈ 2·(1/12).
    const sd = result.byYear[1]!.sd
    expect(sd).toBeGreaterThan(0.35)
    expect(sd).toBeLessThan(0.46)
  })
})

describe('land-motion draws: validation', () => {
  const release = { form: 'samples' as const, baselineYear: 2000, anchorYears: [2100], draws: [[0.1], [0.2], [0.3]] }
  const input = (landMotion: OutlookInput['landMotion']) =>
    baseInput({ components: [normalComponent('ocean', { 2100: [0.3, 0.1] }), { key: 'ice', release }], landMotion })

  it('says what to fix for each broken link', () => {
    expect(issuesOf(input({ draws: [1, 2], jointWith: 'ice', epoch: 2000 }))).toEqual([
      'landMotion.draws: has 2 draws but the release of "ice" has 3; give one land-motion draw per release draw (same draw index), or remove jointWith',
    ])
    expect(issuesOf(input({ draws: [1, 2, 3], jointWith: 'glaciers', epoch: 2000 }))[0]).toContain(
      'names no component of this outlook ("glaciers"); use one of "ocean", "ice"',
    )
    expect(issuesOf(input({ draws: [1, 2, 3], jointWith: 'ocean', epoch: 2000 }))[0]).toContain(
      'component "ocean" has a normal release, not draws; a joint link needs a release given as draws',
    )
    expect(issuesOf(input({ rateMmPerYear: 1, jointWith: 'ice', epoch: 2000 }))[0]).toContain('give draws or remove jointWith')
    expect(issuesOf(input({ epoch: 2000 }))[0]).toContain('landMotion.rateMmPerYear: is needed')
    expect(issuesOf(input({ draws: [1, 2, 3], jointWith: 'ice', epoch: 2000 }))).toEqual([])
  })
})

describe('land-motion draws and an observed record', () => {
  it('weights the draws by the record: the conjugate normal posterior of the rate', () => {
    // Rise observed yearly 2001–2050 along rate 5 mm/yr: 0.005·k − 0.005·k = 0 m, k = t − 2000, white
    // residuals of sd s = 0.05 m. With a flat prior on the rate (uniform draws over 0–10 mm/yr) the
    // posterior is normal about 5 with sd s·1000/√Σk² = 0.240 mm/yr (least squares through the origin),
    // so the rise in 2100, 0.5 − rate/10, is 0.0 ± 0.024 m.
    const n = 1000
    const draws = Array.from({ length: n }, (_, j) => ((j + 0.5) / n) * 10)
    const times = Array.from({ length: 50 }, (_, k) => 2001 + k)
    const result = runOutlook(baseInput({
      samples: N,
      components: [fixedComponent],
      landMotion: { draws, epoch: 2000 },
      // Read to 2100 (the default reach ends in 2099, as long after the record as it spans).
      observations: { times, rise: times.map(() => 0), residualSd: 0.05, phi: 0, reach: 'whole-outlook' },
    }))
    const update = result.observationUpdate!
    if (update.refused) throw new Error(`update refused, ESS ${update.ess}`)
    const updated = update.byYear[1]!
    const sd = (0.05 * 1000) / Math.sqrt(times.reduce((sum, t) => sum + (t - 2000) ** 2, 0)) / 10
    expect(Math.abs(updated.mean.value)).toBeLessThan(4 * updated.mean.se)
    expect(updated.sd).toBeGreaterThan(0.8 * sd)
    expect(updated.sd).toBeLessThan(1.2 * sd)
  })
})
