import { describe, expect, it } from 'vitest'
import { EngineInputError } from '../../../shared/engine/errors'
import { fitGumbelStationaryMle, fitGumbelWithTrend } from '../../../shared/engine/gumbel-trend'
import { blockStreamState, nextUint32 } from '../../../shared/engine/rng'

const EPOCH = 2005
const YEARS = Array.from({ length: 40 }, (_, i) => 1980 + i)
const TRUTH = { location: 1.5, trendPerYear: 0.008, scale: 0.12 }
const SEEDS = Array.from({ length: 200 }, (_, i) => i + 1)

/** Gumbel maxima by inverse CDF, x = μ(t) − λ·ln(−ln U) [practice]; U never reaches 0 or 1. */
function record(seed: number, trendPerYear: number, years = YEARS) {
  const state = blockStreamState(seed, 0)
  return years.map((year) => {
    const u = (nextUint32(state) + 0.5) / 2 ** 32
    return { year, value: TRUTH.location + trendPerYear * (year - EPOCH) - TRUTH.scale * Math.log(-Math.log(u)) }
  })
}

/** Gumbel log-likelihood written out again here: Σ −ln λ − z − e^{−z}, z = (x − μ₀ − μ₁(t − epoch))/λ. */
function logLikelihood(
  maxima: { year: number, value: number }[],
  location: number,
  trend: number,
  scale: number,
): number {
  return maxima.reduce((sum, { year, value }) => {
    const z = (value - location - trend * (year - EPOCH)) / scale
    return sum - Math.log(scale) - z - Math.exp(-z)
  }, 0)
}

/**
 * Stationary Gumbel MLE, solved independently of the engine: the scale equation
 * λ = x̄ − Σ x·e^{−x/λ} / Σ e^{−x/λ}, then μ = −λ·ln(mean e^{−x/λ})
 * [memory: the standard Gumbel likelihood equations, e.g. Coles 2001 §3.3 and hydrology texts].
 * Solved by bisection; values are centred so the exponentials stay in range.
 */
function stationaryMleByScaleEquation(values: number[]): { location: number, scale: number } {
  const mean = values.reduce((a, b) => a + b) / values.length
  const centred = values.map(x => x - mean)
  const excess = (scale: number) => {
    const weights = centred.map(y => Math.exp(-y / scale))
    const weighted = centred.reduce((sum, y, i) => sum + y * weights[i]!, 0) / weights.reduce((a, b) => a + b)
    return -weighted - scale
  }
  let low = 1e-6
  let high = 100
  for (let i = 0; i < 200; i++) {
    const mid = (low + high) / 2
    if (excess(mid) > 0) low = mid
    else high = mid
  }
  const scale = (low + high) / 2
  const meanWeight = centred.reduce((sum, y) => sum + Math.exp(-y / scale), 0) / values.length
  return { scale, location: mean - scale * Math.log(meanWeight) }
}

const mean = (xs: number[]) => xs.reduce((a, b) => a + b) / xs.length
const sd = (xs: number[]) => Math.sqrt(xs.reduce((a, x) => a + (x - mean(xs)) ** 2, 0) / (xs.length - 1))

describe('Gumbel with a linear trend in location, fitted by maximum likelihood', () => {
  const fits = SEEDS.map(seed => fitGumbelWithTrend(record(seed, TRUTH.trendPerYear), EPOCH))
  const stationary = SEEDS.map(seed => fitGumbelStationaryMle(record(seed, TRUTH.trendPerYear).map(m => m.value)))

  it('recovers a rise of 8 mm/yr: 2-SE intervals cover the truth in most of 200 records', () => {
    // [practice] a ±2 SE Wald interval covers the truth in about 95.4 % of records; ML standard errors
    // from 40 values run slightly small (the scale estimate is biased low by O(1/n)), so allow 88 %.
    // With 200 records the binomial spread of the coverage is about 1.5 points.
    const coverTrend = fits.filter(f => Math.abs(f.trendPerYear - TRUTH.trendPerYear) <= 2 * f.se.trendPerYear).length
    const coverLocation = fits.filter(f => Math.abs(f.location - TRUTH.location) <= 2 * f.se.location).length
    expect(coverTrend / SEEDS.length).toBeGreaterThanOrEqual(0.88)
    expect(coverLocation / SEEDS.length).toBeGreaterThanOrEqual(0.88)
    // [practice] the ML estimates are consistent: their mean sits within a few of its own standard errors
    // (sd/√200 ≈ 0.00012 m/yr for the trend) of the truth.
    expect(Math.abs(mean(fits.map(f => f.trendPerYear)) - TRUTH.trendPerYear)).toBeLessThan(0.0005)
    expect(Math.abs(mean(fits.map(f => f.location)) - TRUTH.location)).toBeLessThan(0.01)
    expect(Math.abs(mean(fits.map(f => f.scale)) - TRUTH.scale)).toBeLessThan(0.01)
  })

  it('has the trend spread the Fisher information predicts: sd ≈ λ/√Σ(t − t̄)²', () => {
    // [practice] derived from the Gumbel Fisher information (1/λ²)·[[1, −(1−γ)], [−(1−γ), π²/6 + (1−γ)²]]
    // per observation: with a regressor t the trend's information is Σ(t − t̄)²/λ² and, about the record's
    // mean year, uncoupled from location and scale. 40 consecutive years: Σ(t − t̄)² = n(n² − 1)/12 = 5330.
    const expected = TRUTH.scale / Math.sqrt((40 * (40 ** 2 - 1)) / 12)
    expect(expected).toBeCloseTo(0.001644, 6)
    // The sd of 200 estimates is itself uncertain by about 5 %.
    expect(sd(fits.map(f => f.trendPerYear)) / expected).toBeGreaterThan(0.85)
    expect(sd(fits.map(f => f.trendPerYear)) / expected).toBeLessThan(1.15)
  })

  it('shows the stationary fit of the same records biased: location at the epoch too low, scale too wide', () => {
    // [practice] the rise spans 0.32 m over 40 years; its variance b²(n² − 1)/12 = 0.0085 m² adds to the
    // Gumbel variance π²λ²/6 = 0.0237 m², so a stationary scale of about √(6·0.0322)/π ≈ 0.14 m; its location
    // sits near the record's middle (1999.5), 5.5 years of rise (0.044 m) and γ·0.02 m below μ(2005) = 1.5 m.
    const scale = mean(stationary.map(f => f.scale))
    const location = mean(stationary.map(f => f.location))
    expect(scale).toBeGreaterThan(TRUTH.scale + 0.015)
    expect(location).toBeLessThan(TRUTH.location - 0.03)
    expect(stationary.filter((f, i) => f.scale > fits[i]!.scale).length / SEEDS.length).toBeGreaterThan(0.95)
  })

  it('finds no trend in a sea that does not rise, in most records', () => {
    const still = SEEDS.map(seed => fitGumbelWithTrend(record(seed, 0), EPOCH))
    // [practice] ±2 SE covers zero in about 95 % of records when there is no trend.
    expect(
      still.filter(f => Math.abs(f.trendPerYear) <= 2 * f.se.trendPerYear).length / SEEDS.length,
    ).toBeGreaterThanOrEqual(0.88)
    expect(Math.abs(mean(still.map(f => f.trendPerYear)))).toBeLessThan(0.0005)
  })

  it('matches the stationary MLE from the scale equation when the record has no trend by symmetry', () => {
    // [practice] a record whose values mirror about the epoch gives a likelihood symmetric in the trend's
    // sign; the Gumbel likelihood has one maximum, so the fitted trend is 0 and location and scale are the
    // stationary MLE's.
    const half = record(11, 0, Array.from({ length: 19 }, (_, i) => 1986 + i))
    const centre = { year: EPOCH, value: 1.63 }
    const mirrored = [...half, centre, ...half.map(({ year, value }) => ({ year: 2 * EPOCH - year, value }))]
    const fit = fitGumbelWithTrend(mirrored, EPOCH)
    const reference = stationaryMleByScaleEquation(mirrored.map(m => m.value))
    expect(Math.abs(fit.trendPerYear)).toBeLessThan(1e-12)
    expect(fit.location).toBeCloseTo(reference.location, 10)
    expect(fit.scale).toBeCloseTo(reference.scale, 10)
    const plain = fitGumbelStationaryMle(mirrored.map(m => m.value))
    expect(plain.location).toBeCloseTo(reference.location, 10)
    expect(plain.scale).toBeCloseTo(reference.scale, 10)
    expect(plain.logLikelihood).toBeCloseTo(fit.logLikelihood, 9)
  })

  it('agrees with the scale equation on an ordinary record too', () => {
    const values = record(5, 0).map(m => m.value)
    const reference = stationaryMleByScaleEquation(values)
    const fit = fitGumbelStationaryMle(values)
    expect(fit.location).toBeCloseTo(reference.location, 10)
    expect(fit.scale).toBeCloseTo(reference.scale, 10)
  })

  it('stands at a maximum: zero slope and the reported curvature, by finite differences of the likelihood', () => {
    // [practice] central differences of the log-likelihood written out in this file.
    const maxima = record(3, TRUTH.trendPerYear)
    const fit = fitGumbelWithTrend(maxima, EPOCH)
    const theta = [fit.location, fit.trendPerYear, fit.scale]
    const steps = [1e-4, 1e-6, 1e-4]
    const at = (p: number[]) => logLikelihood(maxima, p[0]!, p[1]!, p[2]!)
    expect(fit.logLikelihood).toBeCloseTo(at(theta), 10)
    const moved = (i: number, d: number, j = -1, e = 0) =>
      theta.map((v, k) => v + (k === i ? d : 0) + (k === j ? e : 0))
    for (let i = 0; i < 3; i++) {
      const slope = (at(moved(i, steps[i]!)) - at(moved(i, -steps[i]!))) / (2 * steps[i]!)
      expect(Math.abs(slope * fit.covariance[i]![i]! ** 0.5)).toBeLessThan(1e-5)
    }
    // Observed information by finite differences, inverted, against the reported covariance.
    const info = [0, 1, 2].map(i => [0, 1, 2].map((j) => {
      const h = steps[i]!
      const k = steps[j]!
      return (
        -(at(moved(i, h, j, k)) - at(moved(i, h, j, -k)) - at(moved(i, -h, j, k)) + at(moved(i, -h, j, -k)))
        / (4 * h * k)
      )
    }))
    const product = fit.covariance.map(row => [0, 1, 2].map(j => row.reduce((s, v, k) => s + v * info[k]![j]!, 0)))
    product.forEach((row, i) => row.forEach((v, j) => expect(v).toBeCloseTo(i === j ? 1 : 0, 4)))
    expect(fit.se.trendPerYear).toBeCloseTo(Math.sqrt(fit.covariance[1]![1]!), 15)
  })

  it('gives the stationary standard errors the Gumbel Fisher information predicts for a long record', () => {
    // [memory] asymptotic variances of the Gumbel MLE: Var μ̂ ≈ 1.1087 λ²/n, Var λ̂ ≈ 0.6079 λ²/n
    // (inverse of the Fisher information above; e.g. Kotz & Nadarajah 2000, Extreme Value Distributions).
    const n = 4000
    const values = record(21, 0, Array.from({ length: n }, (_, i) => i)).map(m => m.value)
    const fit = fitGumbelStationaryMle(values)
    expect(fit.se.location / (TRUTH.scale * Math.sqrt(1.1087 / n))).toBeCloseTo(1, 1)
    expect(fit.se.scale / (TRUTH.scale * Math.sqrt(0.6079 / n))).toBeCloseTo(1, 1)
  })

  it('centres time at the epoch: moving the epoch moves the location along the trend, not the trend', () => {
    const maxima = record(7, TRUTH.trendPerYear)
    const at2005 = fitGumbelWithTrend(maxima, 2005)
    const at2050 = fitGumbelWithTrend(maxima, 2050)
    // [practice] μ(2050) = μ(2005) + 45·μ₁ for the same fitted line.
    expect(at2050.location).toBeCloseTo(at2005.location + 45 * at2005.trendPerYear, 9)
    expect(at2050.trendPerYear).toBeCloseTo(at2005.trendPerYear, 12)
    expect(at2050.scale).toBeCloseTo(at2005.scale, 10)
    expect(at2050.se.location).toBeGreaterThan(at2005.se.location)
    expect([at2005.firstYear, at2005.lastYear, at2005.sampleSize]).toEqual([1980, 2019, 40])
  })

  it('refuses what it cannot fit, saying what to fix', () => {
    const line = YEARS.map(year => ({ year, value: 1 + 0.01 * (year - EPOCH) }))
    expect(() => fitGumbelWithTrend(line, EPOCH)).toThrow(/straight line in time/)
    expect(() =>
      fitGumbelWithTrend(
        [
          { year: 2000, value: 1 },
          { year: 2000, value: 2 },
          { year: 2000, value: 3 },
        ],
        EPOCH,
      ),
    ).toThrow(/maxima from different years/)
    expect(() =>
      fitGumbelWithTrend(
        [
          { year: 2000, value: 1 },
          { year: 2001, value: 2 },
        ],
        EPOCH,
      ),
    ).toThrow(/at least 3 annual maxima/)
    expect(() =>
      fitGumbelWithTrend(
        record(1, 0).map((m, i) => (i === 4 ? { ...m, value: Number.NaN } : m)),
        EPOCH,
      ),
    ).toThrow(/annualMaxima\[4\]\.value/)
    expect(() => fitGumbelWithTrend(record(1, 0), Number.NaN)).toThrow(/referenceEpoch/)
    expect(() => fitGumbelWithTrend(record(1, 0), EPOCH, { maxIterations: 1 })).toThrow(EngineInputError)
    expect(() => fitGumbelWithTrend(record(1, 0), EPOCH, { maxIterations: 1 })).toThrow(/did not settle/)
  })
})
