import { describe, expect, it } from 'vitest'
import jStatPackage from 'jstat'
import { planTrajectories, sampleTrajectories } from '../../../shared/engine/trajectories'
import { annualExceedance } from '../../../shared/engine/flood-chance'
import {
  gaugeNoise,
  noiseFromFit,
  signposts,
  thresholdGrid,
  trajectoryTipping,
} from '../../../shared/observations/signposts'

const { jStat } = jStatPackage

// Linear rise with a normal rate r ~ N(μ, σ) mm/yr from the epoch, watched through white observation
// noise of sd σₙ: the miss, needless and late rates have closed forms.
//
// [textbook: ordinary least squares slope variance, e.g. Draper & Smith, "Applied Regression Analysis",
// ch. 1] With values at years x = 0 … n − 1 the fitted slope is r + e with e ~ N(0, σₙ²/Sxx),
// Sxx = Σ(x − x̄)² = n(n² − 1)/12, independent of r. A trajectory's rise r·(t − E) first exceeds h in
// year E + ⌊h/r⌋ + 1, so
//   it tips by the horizon T        iff r > r_T = h/(T − E)
//   its decision is due before s    iff tipping year ≤ s + L − 1  iff r > r_L = h/(s + L − 1 − E)
// and, with f the density of r,
//   missed   = ∫_{r_T}^∞  f(r) Φ((x − r)/σₑ) dr
//   needless = ∫_{−∞}^{r_T} f(r) (1 − Φ((x − r)/σₑ)) dr
//   late     = ∫_{r_L}^∞  f(r) (1 − Φ((x − r)/σₑ)) dr
// computed below by Simpson's rule with jstat's normal distribution.

const EPOCH = 2020
const HORIZON = 2120
const MU = 5
const SIGMA = 1.5
const HEIGHT = 0.3
const LEAD = 20
const NOISE_SD = 0.03
const N = 20_000

function linearRiseInput() {
  const years = Array.from({ length: 10 }, (_, k) => 2030 + 10 * k)
  return {
    baselineYear: EPOCH, years, samples: N, seed: 11,
    components: [{ key: 'rate', scale: 1, release: {
      form: 'normal', baselineYear: EPOCH, anchorYears: [HORIZON],
      mean: [(MU / 1000) * (HORIZON - EPOCH)], sd: [(SIGMA / 1000) * (HORIZON - EPOCH)],
    } }],
    heights: { from: 0, to: 1, step: 0.1 },
  }
}

function simpson(f: (r: number) => number, a: number, b: number, intervals = 4000): number {
  const h = (b - a) / intervals
  let sum = f(a) + f(b)
  for (let k = 1; k < intervals; k++) sum += (k % 2 ? 4 : 2) * f(a + k * h)
  return (sum * h) / 3
}

function closedForm(threshold: number, signalYear: number, height = HEIGHT) {
  const n = signalYear - EPOCH + 1
  const sigmaE = (1000 * NOISE_SD) / Math.sqrt((n * (n * n - 1)) / 12)
  const rT = (1000 * height) / (HORIZON - EPOCH)
  const rL = (1000 * height) / (signalYear + LEAD - 1 - EPOCH)
  const density = (r: number) => jStat.normal.pdf(r, MU, SIGMA)
  const fires = (r: number) => 1 - jStat.normal.cdf(threshold, r, sigmaE)
  const low = MU - 9 * SIGMA
  const high = MU + 9 * SIGMA
  return {
    missed: simpson(r => density(r) * (1 - fires(r)), rT, high),
    needless: simpson(r => density(r) * fires(r), low, rT),
    late: simpson(r => density(r) * fires(r), rL, high),
  }
}

describe('signposts against the closed form for linear rise and white noise', () => {
  const trajectories = sampleTrajectories(planTrajectories(linearRiseInput()), N)
  const noise = { sd: NOISE_SD, phi: 0, source: 'default' as const }
  const signalYears = [2035, 2050]
  const thresholds = [3, 4, 5, 6]
  const result = signposts(trajectories, { height: HEIGHT, leadTimeYears: LEAD }, signalYears, noise, 3, thresholds)

  it('tips in the share of trajectories whose rate exceeds h/(T − E)', () => {
    const expected = 1 - jStat.normal.cdf((1000 * HEIGHT) / (HORIZON - EPOCH), MU, SIGMA)
    expect(Math.abs(result.tipped - expected)).toBeLessThan(4 * Math.sqrt((expected * (1 - expected)) / N))
  })

  for (const [k, year] of signalYears.entries()) {
    for (const [j, x] of thresholds.entries()) {
      it(`matches the miss, needless and late rates of a signal of ${x} mm/yr by ${year} within 4 Monte Carlo SE`, () => {
        const point = result.curves[k]!.points[j]!
        const expected = closedForm(x, year)
        for (const rate of ['missed', 'needless', 'late'] as const) {
          const p = expected[rate]
          // [practice] a proportion of N independent trajectories has SE √(p(1 − p)/N); 1/N covers p near 0.
          const se = Math.sqrt((p * (1 - p)) / N) + 1 / N
          expect(Math.abs(point[rate] - p), `${rate}: ${point[rate]} against ${p}`).toBeLessThan(4 * se)
        }
      })
    }
  }

  it('accounts for every trajectory once', () => {
    for (const curve of result.curves) {
      for (const p of curve.points) {
        const quiet = 1 - p.timely - p.late - p.missed - p.needless
        expect(quiet).toBeGreaterThanOrEqual(-1e-12)
        expect(p.timely + p.late + p.missed).toBeCloseTo(result.tipped, 12)
        expect(p.fired).toBeCloseTo(p.timely + p.late + p.needless, 12)
      }
    }
  })

  it('trades misses for needless signals as the threshold rises', () => {
    const points = result.curves[1]!.points
    for (let j = 1; j < points.length; j++) {
      expect(points[j]!.missed).toBeGreaterThanOrEqual(points[j - 1]!.missed)
      expect(points[j]!.needless).toBeLessThanOrEqual(points[j - 1]!.needless)
    }
  })

  it('refuses a signal year before the shortest record or after the horizon', () => {
    const decision = { height: HEIGHT, leadTimeYears: LEAD }
    expect(() => signposts(trajectories, decision, [2022], noise, 3)).toThrow(/from 2025 to 2120/)
    expect(() => signposts(trajectories, decision, [2121], noise, 3)).toThrow(/from 2025 to 2120/)
  })
})

// A flood level H with Gumbel annual maxima (location μ, scale λ above mean sea level at the epoch) tips
// when its annual chance 1 − F(H − r) passes the tolerance p. [textbook: Coles 2001, "An Introduction to
// Statistical Modeling of Extreme Values", §3.1.3, the Gumbel distribution F(z) = exp(−e^{−(z − μ)/λ})]
// 1 − F(H − r) > p ⟺ r > h* = H − μ + λ·ln(−ln(1 − p)), so under linear rise the miss, needless and late
// rates are the mean-sea-level closed form above with h* for h.
describe('signposts for a flood level against the closed form', () => {
  const flood = { location: 0.9, scale: 0.1, tolerance: 0.1 }
  const level = 1.4
  const effective = level - flood.location + flood.scale * Math.log(-Math.log(1 - flood.tolerance))
  const trajectories = sampleTrajectories(planTrajectories(linearRiseInput()), N)
  const noise = { sd: NOISE_SD, phi: 0, source: 'default' as const }
  const decision = { height: level, leadTimeYears: LEAD, flood }
  const result = signposts(trajectories, decision, [2050], noise, 3, [3, 5, 7])

  it('tips each trajectory in the first year its Gumbel annual chance passes the tolerance', () => {
    const tipping = trajectoryTipping(trajectories, effective)
    const { count, yearCount, firstYear, rise } = trajectories
    for (let i = 0; i < count; i += 97) {
      let year = -1
      for (let y = 0; y < yearCount && year < 0; y++) {
        if (annualExceedance(rise[i * yearCount + y]!, level - flood.location, 1 / flood.scale) > flood.tolerance)
          year = firstYear + y
      }
      expect(tipping[i]).toBe(year)
    }
  })

  it('matches the miss, needless and late rates of h* = H − μ + λ·ln(−ln(1 − p)) within 4 Monte Carlo SE', () => {
    // h* ≈ 0.275 m: most trajectories (5 ± 1.5 mm/yr over a century) tip by the horizon, some do not.
    const expectedTipped = 1 - jStat.normal.cdf((1000 * effective) / (HORIZON - EPOCH), MU, SIGMA)
    const tippedSe = Math.sqrt((expectedTipped * (1 - expectedTipped)) / N)
    expect(Math.abs(result.tipped - expectedTipped)).toBeLessThan(4 * tippedSe)
    for (const [j, x] of [3, 5, 7].entries()) {
      const expected = closedForm(x, 2050, effective)
      for (const rate of ['missed', 'needless', 'late'] as const) {
        const p = expected[rate]
        // [practice] a proportion of N independent trajectories has SE √(p(1 − p)/N); 1/N covers p near 0.
        const se = Math.sqrt((p * (1 - p)) / N) + 1 / N
        expect(Math.abs(result.curves[0]!.points[j]![rate] - p), `${rate} at ${x}`).toBeLessThan(4 * se)
      }
    }
  })
})

describe('the threshold grid', () => {
  it('spans the fitted rates at a round step', () => {
    const rates = Float64Array.from({ length: 1000 }, (_, k) => 2 + (6 * k) / 999)
    const grid = thresholdGrid([rates])
    expect(grid[0]).toBeLessThanOrEqual(2.06)
    expect(grid.at(-1)).toBeGreaterThanOrEqual(7.94)
    expect(grid.length).toBeLessThanOrEqual(32)
    expect(grid[1]! - grid[0]!).toBeCloseTo(0.2, 12)
  })
})

describe('simulated gauge noise', () => {
  it('has the sd and lag-one autocorrelation it is given', () => {
    const years = 100
    const noise = gaugeNoise(2000, years, { sd: 0.03, phi: 0.6, source: 'gauge-record' }, 5)
    let sq = 0
    let lag = 0
    let pairs = 0
    for (let i = 0; i < 2000; i++) {
      for (let y = 0; y < years; y++) {
        sq += noise[y * 2000 + i]! ** 2
        if (y > 0) { lag += noise[y * 2000 + i]! * noise[(y - 1) * 2000 + i]!; pairs++ }
      }
    }
    // [practice] 200,000 values (effective size about a quarter of that at φ = 0.6): sd within 1 %, φ within 0.02.
    const variance = sq / (2000 * years)
    expect(Math.sqrt(variance)).toBeCloseTo(0.03, 3)
    expect(Math.abs(lag / pairs / variance - 0.6)).toBeLessThan(0.02)
  })
})

describe('noise of annual means from a record\'s fit', () => {
  it('keeps an annual fit as it is', () => {
    expect(noiseFromFit({ resolution: 'annual', residualSd: 0.04, phi: 0.3 }))
      .toEqual({ sd: 0.04, phi: 0.3, source: 'gauge-record' })
  })

  it('averages white monthly noise to sd/√12 and no autocorrelation', () => {
    // [practice] the mean of 12 independent values has sd σ/√12.
    const noise = noiseFromFit({ resolution: 'monthly', residualSd: 0.06, phi: 0 })
    expect(noise.sd).toBeCloseTo(0.06 / Math.sqrt(12), 12)
    expect(noise.phi).toBe(0)
  })

  it('keeps monthly autocorrelation in the annual means', () => {
    const noise = noiseFromFit({ resolution: 'monthly', residualSd: 0.06, phi: 0.8 })
    expect(noise.sd).toBeGreaterThan(0.06 / Math.sqrt(12))
    expect(noise.phi).toBeGreaterThan(0)
    expect(noise.phi).toBeLessThan(0.8)
  })
})
