import { describe, expect, it } from 'vitest'
import {
  finishOutlook,
  MIN_EFFECTIVE_SAMPLES,
  mergePartials,
  planOutlook,
  runBlocks,
  runOutlook,
  type EngineInputError,
  type ObservationsInput,
  type OutlookInput,
  type OutlookResult,
} from '../../../shared/engine'
import jStatPkg from 'jstat'
import { baseInput, normalComponent } from './helpers'

const { jStat } = jStatPkg

/** Binomial standard error of a proportion p at an effective sample size n. */
function proportionSe(p: number, n: number): number {
  return Math.sqrt((p * (1 - p)) / n)
}

// Likelihood weighting of the trajectories by an observed record (shared/engine/observation-plan.ts).

/** A seeded stream of standard normals (Box–Muller on a 32-bit LCG): the tests' own noise, not the engine's. */
function normals(seed: number): () => number {
  let state = seed >>> 0
  const uniform = () => {
    state = (Math.imul(state, 1664525) + 1013904223) >>> 0
    return (state + 0.5) / 2 ** 32
  }
  return () => Math.sqrt(-2 * Math.log(uniform())) * Math.cos(2 * Math.PI * uniform())
}

/** AR(1) residuals with marginal sd s and lag-one correlation φ, one per year. */
function ar1(count: number, sd: number, phi: number, normal: () => number): number[] {
  const out: number[] = []
  let previous = sd * normal()
  out.push(previous)
  for (let i = 1; i < count; i++) {
    previous = phi * previous + sd * Math.sqrt(1 - phi * phi) * normal()
    out.push(previous)
  }
  return out
}

function withoutUpdate(result: OutlookResult): string {
  const { observationUpdate: _, ...rest } = result
  return JSON.stringify(rest)
}

function updated(result: OutlookResult) {
  const update = result.observationUpdate!
  if (update.refused) throw new Error(`update refused at ESS ${update.ess}`)
  return update
}

/** Linear rise from 2000 with rate ~ N(μ₀, σ₀) metres a year: one normal release anchored in 2100. */
const PRIOR_RATE = 0.003
const PRIOR_RATE_SD = 0.001
function linearInput(samples: number, observations?: ObservationsInput): OutlookInput {
  return baseInput({
    years: [2000, 2030, 2100],
    samples,
    components: [normalComponent('ocean', { 2100: [100 * PRIOR_RATE, 100 * PRIOR_RATE_SD] })],
    thresholds: [{ key: 'half-metre', height: 0.5 }],
    ...(observations ? { observations } : {}),
  })
}

/**
 * Thirty annual values 2000.5–2029.5 along 3.6 mm/yr with white noise of 2 cm (stream `seed`), and the
 * conjugate normal posterior of the rate under the outlook's prior N(μ₀, σ₀²) [practice: conjugate normal
 * prior with a Gaussian likelihood of known variance, e.g. Gelman et al., Bayesian Data Analysis, 3rd ed.,
 * §2.5 and §14.2]: precision 1/σ₀² + Σxᵢ²/σ², mean (μ₀/σ₀² + Σxᵢyᵢ/σ²) / precision.
 */
function conjugateRecord(seed: number) {
  const sigma = 0.02
  const normal = normals(seed)
  const times = Array.from({ length: 30 }, (_, i) => 2000.5 + i)
  const rise = times.map(t => 0.0036 * (t - 2000) + sigma * normal())
  let xx = 0
  let xy = 0
  times.forEach((t, i) => {
    xx += (t - 2000) ** 2
    xy += (t - 2000) * rise[i]!
  })
  const precision = 1 / PRIOR_RATE_SD ** 2 + xx / sigma ** 2
  const mean = (PRIOR_RATE / PRIOR_RATE_SD ** 2 + xy / sigma ** 2) / precision
  return { sigma, times, rise, mean, sd: 1 / Math.sqrt(precision) }
}

// The weighting's own checks read the record to every year (`reach: 'whole-outlook'`): the posterior
// they compare with is the weighting's. How far ahead the product reads it is checked further down.
describe('observation-updated outlooks', () => {
  it('leaves an outlook without a record, or with an empty one, exactly as it was', () => {
    const plain = runOutlook(linearInput(5000))
    expect(plain.observationUpdate).toBeUndefined()
    const empty = runOutlook(linearInput(5000, { times: [], rise: [], residualSd: 0.02, phi: 0 }))
    expect(JSON.stringify(empty)).toBe(JSON.stringify(plain))
  })

  it('keeps the unweighted numbers bit for bit when a record is given', () => {
    const times = Array.from({ length: 30 }, (_, i) => 2000.5 + i)
    const record = { times, rise: times.map(t => 0.0035 * (t - 2000)), residualSd: 0.02, phi: 0.4 }
    const plain = runOutlook(linearInput(5000))
    const weighted = runOutlook(linearInput(5000, record))
    expect(weighted.observationUpdate).toBeDefined()
    expect(withoutUpdate(weighted)).toBe(withoutUpdate(plain))
  })

  it('gives the unweighted percentiles, chances and trigger years for a record that says nothing', () => {
    // Residual sd of 1 km: every trajectory is equally likely, so the weights are equal up to 1e-9.
    const times = Array.from({ length: 30 }, (_, i) => 2000.5 + i)
    const plain = runOutlook(linearInput(20_000))
    const update = updated(
      runOutlook(linearInput(20_000, { times, rise: times.map(() => 0), residualSd: 1000, phi: 0 })),
    )
    expect(update.ess).toBeCloseTo(20_000, 3)
    plain.byYear.forEach((year, t) => {
      year.percentiles.forEach((p, k) => expect(update.byYear[t]!.percentiles[k]!.value).toBeCloseTo(p.value, 7))
      expect(update.byYear[t]!.mean.value).toBeCloseTo(year.mean.value, 7)
    })
    expect(update.thresholds[0]!.byYear.map(e => e.value)).toEqual(
      plain.thresholds[0]!.byYear.map(e => expect.closeTo(e.value, 7)),
    )
    expect(update.thresholds[0]!.triggerYears).toEqual(
      plain.thresholds[0]!.triggerYears.map(({ tolerance, year }) => ({ tolerance, year })),
    )
  })

  it('matches the conjugate normal–normal posterior of a linear rate under white noise', () => {
    // [practice: conjugate normal prior with a Gaussian likelihood of known variance, e.g. Gelman et al.,
    // Bayesian Data Analysis, 3rd ed., §2.5 and §14.2] rate ~ N(μ₀, σ₀²), yᵢ = rate·xᵢ + εᵢ, εᵢ ~ N(0, σ²):
    // posterior precision 1/σ₀² + Σxᵢ²/σ², mean (μ₀/σ₀² + Σxᵢyᵢ/σ²) / precision; rise in 2100 = 100·rate.
    const { sigma, times, rise, mean, sd } = conjugateRecord(11)
    const update = updated(runOutlook(linearInput(100_000, { times, rise, residualSd: sigma, phi: 0, reach: 'whole-outlook' })))
    const year2100 = update.byYear[2]!
    // Within four Monte Carlo SEs (the weighted mean's SE uses the effective sample size).
    expect(Math.abs(year2100.mean.value - 100 * mean)).toBeLessThan(4 * year2100.mean.se)
    // The sd of a weighted sample of ESS ≈ 10⁴: relative SE about 1/√(2·ESS) < 1 %; 4 % allows for the weights.
    expect(year2100.sd / (100 * sd)).toBeCloseTo(1, 1)
    expect(Math.abs(year2100.sd / (100 * sd) - 1)).toBeLessThan(0.04)
    // The median of a normal posterior is its mean.
    expect(Math.abs(year2100.percentiles[3]!.value - 100 * mean)).toBeLessThan(4 * year2100.percentiles[3]!.se + 0.001)
  })

  it('puts updated trigger years where the conjugate posterior\'s chance first reaches each tolerance', () => {
    // [practice: conjugate normal–normal posterior as above] rise = rate·(year − 2000), so the chance of
    // passing 0.3 m in year 2000 + n is 1 − Φ((0.3/n − mean)/sd) under the posterior; the height is
    // crossed between the output years 2030 and 2100, so the updated trigger years come from the annual
    // counts inside that interval.
    const { sigma, times, rise, mean, sd } = conjugateRecord(23)
    const chance = (n: number) => 1 - jStat.normal.cdf((0.3 / n - mean) / sd, 0, 1)
    const result = runOutlook({
      ...linearInput(100_000, { times, rise, residualSd: sigma, phi: 0, reach: 'whole-outlook' }),
      thresholds: [{ key: 'thirty-centimetres', height: 0.3 }],
    })
    const update = updated(result)
    const margin = 4 * proportionSe(0.5, update.ess)
    let checked = 0
    for (const { tolerance, year } of update.thresholds[0]!.triggerYears) {
      let n = 1
      while (n <= 100 && chance(n) < tolerance) n++
      expect(n).toBeGreaterThan(30)
      expect(n).toBeLessThan(100)
      // A year whose chance is within Monte Carlo error of the tolerance may go either way.
      const clear = chance(n - 1) < tolerance - margin && chance(n) > tolerance + margin
      if (clear) {
        expect(year).toBe(2000 + n)
        checked++
      }
      else expect([2000 + n - 1, 2000 + n]).toContain(year)
    }
    expect(checked).toBeGreaterThan(0)
  })

  it('matches the posterior under AR(1) residuals (tridiagonal precision of the record)', () => {
    // [practice: the inverse of an AR(1) covariance s²φ^|i−j| is tridiagonal, 1/(s²(1−φ²)) times
    // diag(1, 1+φ², …, 1+φ², 1) with −φ beside the diagonal] posterior precision 1/σ₀² + xᵀQx,
    // mean (μ₀/σ₀² + xᵀQy) / precision.
    const sd = 0.025
    const phi = 0.6
    const times = Array.from({ length: 40 }, (_, i) => 2000.5 + i)
    const noise = ar1(times.length, sd, phi, normals(5))
    const x = times.map(t => t - 2000)
    const y = x.map((value, i) => 0.0026 * value + noise[i]!)
    const quadratic = (a: number[], b: number[]) => {
      const n = a.length
      let total = 0
      for (let i = 0; i < n; i++) {
        const diagonal = i === 0 || i === n - 1 ? 1 : 1 + phi * phi
        total += diagonal * a[i]! * b[i]!
        if (i > 0) total -= phi * (a[i]! * b[i - 1]! + a[i - 1]! * b[i]!)
      }
      return total / (sd * sd * (1 - phi * phi))
    }
    const precision = 1 / PRIOR_RATE_SD ** 2 + quadratic(x, x)
    const mean = (PRIOR_RATE / PRIOR_RATE_SD ** 2 + quadratic(x, y)) / precision
    const update = updated(runOutlook(linearInput(100_000, { times, rise: y, residualSd: sd, phi, reach: 'whole-outlook' })))
    const year2100 = update.byYear[2]!
    expect(Math.abs(year2100.mean.value - 100 * mean)).toBeLessThan(4 * year2100.mean.se)
    expect(Math.abs(year2100.sd / (100 / Math.sqrt(precision)) - 1)).toBeLessThan(0.04)
  })

  it('covers the truth with its updated likely range two times in three, over 1,000 worlds', () => {
    // A world's truth is a trajectory of the outlook itself: scores drawn from the prior give its
    // component values and land motion, and its gauge record adds AR(1) residuals. Conditioned on the
    // record, the 17–83 % range of 2100 must hold the truth 66 % of the time (a Bayesian interval is
    // calibrated on average over worlds drawn from its prior).
    const baseline = 2000
    const sd = 0.03
    const phi = 0.5
    const land = { rateMmPerYear: 1, sigmaMmPerYear: 0.6, epoch: baseline }
    const ocean = { 2050: [0.12, 0.04] as [number, number], 2100: [0.4, 0.12] as [number, number] }
    const times = Array.from({ length: 20 }, (_, i) => baseline + 0.5 + i)
    const normal = normals(2026)
    const riseOf = (z: number, zLand: number, t: number) => {
      const at2050 = ocean[2050][0] + ocean[2050][1] * z
      const at2100 = ocean[2100][0] + ocean[2100][1] * z
      const component = t <= 2050 ? (at2050 * (t - baseline)) / 50 : at2050 + ((at2100 - at2050) * (t - 2050)) / 50
      return component - ((land.rateMmPerYear + land.sigmaMmPerYear * zLand) / 1000) * (t - baseline)
    }
    const worlds = 1000
    let covered = 0
    let refused = 0
    for (let world = 0; world < worlds; world++) {
      const z = normal()
      const zLand = normal()
      const noise = ar1(times.length, sd, phi, normal)
      const result = runOutlook(
        baseInput({
          years: [2050, 2100],
          samples: 4096,
          seed: world,
          components: [normalComponent('ocean', ocean)],
          landMotion: land,
          heights: [0.5],
          observations: {
            times, rise: times.map((t, i) => riseOf(z, zLand, t) + noise[i]!), residualSd: sd, phi, reach: 'whole-outlook',
          },
        }),
      )
      const update = result.observationUpdate!
      if (update.refused) {
        refused++
        continue
      }
      const percentiles = update.byYear[1]!.percentiles
      const truth = riseOf(z, zLand, 2100)
      if (truth >= percentiles[2]!.value && truth <= percentiles[4]!.value) covered++
    }
    // A refused world (its truth deep in a tail, where few trajectories pass near its record) shows no
    // range to count; such worlds must stay rare or leaving them out would flatter the coverage.
    expect(refused).toBeLessThanOrEqual(worlds / 100)
    expect(Math.abs(covered / (worlds - refused) - 0.66)).toBeLessThanOrEqual(0.03)
  }, 30_000)

  it('gives the unweighted numbers for a record that says nothing, with many basis columns', () => {
    // Two releases with anchor years of their own: six basis columns (more than the weights form their
    // moments beside), and anchor years that are no output year (trigger knots of their own).
    const input = (observations?: ObservationsInput) =>
      baseInput({
        years: [2000, 2030, 2080, 2120],
        samples: 20_000,
        components: [
          normalComponent('ocean', { 2050: [0.15, 0.03], 2100: [0.4, 0.1], 2150: [0.7, 0.2] }),
          normalComponent('ice', { 2060: [0.05, 0.02], 2150: [0.5, 0.3] }),
        ],
        thresholds: [{ key: 'low', height: 0.2 }, { key: 'half-metre', height: 0.5 }],
        ...(observations ? { observations } : {}),
      })
    const times = Array.from({ length: 30 }, (_, i) => 2000.5 + i)
    const record = { times, rise: times.map(() => 0), residualSd: 1000, phi: 0 }
    expect(planOutlook(input(record)).basisCount).toBeGreaterThan(4)
    const plain = runOutlook(input())
    const update = updated(runOutlook(input(record)))
    plain.byYear.forEach((year, t) => {
      year.percentiles.forEach((p, k) => expect(update.byYear[t]!.percentiles[k]!.value).toBeCloseTo(p.value, 7))
      expect(update.byYear[t]!.mean.value).toBeCloseTo(year.mean.value, 7)
      expect(update.byYear[t]!.sd).toBeCloseTo(year.sd, 7)
    })
    plain.thresholds.forEach((threshold, m) => {
      expect(update.thresholds[m]!.byYear.map(e => e.value)).toEqual(
        threshold.byYear.map(e => expect.closeTo(e.value, 7)),
      )
      expect(update.thresholds[m]!.triggerYears).toEqual(
        threshold.triggerYears.map(({ tolerance, year }) => ({ tolerance, year })),
      )
    })
  })

  it('refuses the update when the record is far from every trajectory', () => {
    const times = Array.from({ length: 30 }, (_, i) => 2000.5 + i)
    const result = runOutlook(
      linearInput(20_000, { times, rise: times.map(t => 0.05 * (t - 2000)), residualSd: 0.01, phi: 0.3 }),
    )
    const update = result.observationUpdate!
    expect(update.refused).toBe(true)
    expect(update.ess).toBeLessThan(MIN_EFFECTIVE_SAMPLES)
    expect(update).not.toHaveProperty('byYear')
    expect(update).toMatchObject({ reason: 'too-few-effective-samples', minimumEss: MIN_EFFECTIVE_SAMPLES })
  })

  it('gives the same update however the blocks are split and merged', () => {
    const times = Array.from({ length: 30 }, (_, i) => 2000.5 + i)
    const input = linearInput(20_000, { times, rise: times.map(t => 0.0032 * (t - 2000)), residualSd: 0.02, phi: 0.5 })
    const plan = planOutlook(input)
    const whole = finishOutlook(plan, runBlocks(plan, 0, plan.blockCount))
    const parts = [runBlocks(plan, 6, 4), runBlocks(plan, 0, 3), runBlocks(plan, 3, 3)]
    const split = finishOutlook(plan, mergePartials(plan, parts))
    const a = updated(whole)
    const b = updated(split)
    expect(b.ess).toBeCloseTo(a.ess, 6)
    a.byYear.forEach((year, t) => {
      year.percentiles.forEach((p, k) => expect(b.byYear[t]!.percentiles[k]!.value).toBeCloseTo(p.value, 9))
    })
    expect(b.thresholds).toEqual(a.thresholds.map(threshold => ({
      ...threshold,
      byYear: threshold.byYear.map(e => ({ value: expect.closeTo(e.value, 12), se: expect.closeTo(e.se, 12) })),
    })))
  })

  it('refuses a record outside the outlook or off its steps, naming the value', () => {
    const check = (observations: ObservationsInput) => {
      try {
        planOutlook(linearInput(100, observations))
      }
      catch (error) {
        return (error as EngineInputError).issues.map(issue => issue.path)
      }
      return []
    }
    expect(check({ times: [1999.5, 2000.5], rise: [0, 0], residualSd: 0.02, phi: 0 })).toEqual(['observations.times[0]'])
    expect(check({ times: [2000.5, 2001.2], rise: [0, 0], residualSd: 0.02, phi: 0 })).toEqual(['observations.times[1]'])
    expect(check({ times: [2000.5], rise: [0, 0], residualSd: 0.02, phi: 0 })).toEqual(['observations.rise'])
  })
})
