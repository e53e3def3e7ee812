import { describe, expect, it } from 'vitest'
import jStatPkg from 'jstat'
import {
  BLOCK_SIZE,
  claimFromCounter,
  finishOutlook,
  mergePartials,
  planOutlook,
  runBlocks,
  runClaimedBlocks,
  runOutlook,
} from '../../../shared/engine'
import { samplerTables } from '../../../shared/engine/sampler-tables'
import { allNumbers, baseInput, normalComponent } from './helpers'

const { jStat } = jStatPkg

describe('analytic normal case', () => {
  it('independent normal components plus normal land motion give a normal total: exceedance within 4 SE of the normal CDF', () => {
    const input = baseInput({
      samples: 40_000,
      components: [
        normalComponent('ocean-expansion', { 2050: [0.1, 0.03], 2100: [0.3, 0.08] }),
        normalComponent('antarctica', { 2050: [0.05, 0.04], 2100: [0.15, 0.12] }),
      ],
      landMotion: { rateMmPerYear: -2, sigmaMmPerYear: 0.8, epoch: 2000 },
      years: [2030, 2075, 2100],
      heights: [0.05, 0.2, 0.4, 0.6, 0.8, 1.0],
    })
    const result = runOutlook(input)
    const expected = {
      // interpolation in time is linear from zero at 2000: 2030 is 0.6 of 2050, 2075 half way 2050→2100
      2030: { mean: 0.6 * 0.15, sds: [0.6 * 0.03, 0.6 * 0.04] },
      2075: { mean: 0.5 * (0.15 + 0.45), sds: [0.055, 0.08] },
      2100: { mean: 0.45, sds: [0.08, 0.12] },
    } as const
    let checks = 0
    for (const year of result.byYear) {
      const e = expected[year.year as 2030 | 2075 | 2100]
      const elapsed = year.year - 2000
      const mean = e.mean + 0.002 * elapsed
      const sd = Math.sqrt(e.sds[0] ** 2 + e.sds[1] ** 2 + (0.0008 * elapsed) ** 2)
      expect(year.mean.value).toBeGreaterThan(mean - 4 * year.mean.se)
      expect(year.mean.value).toBeLessThan(mean + 4 * year.mean.se)
      expect(year.sd).toBeCloseTo(sd, 2)
      result.heights.forEach((height, h) => {
        // reference library: jstat normal CDF [practice: sum of independent normals is normal]
        const p = 1 - jStat.normal.cdf(height, mean, sd)
        const se = Math.sqrt((p * (1 - p)) / input.samples) + 1e-12
        expect(Math.abs(year.exceedance[h]!.value - p)).toBeLessThanOrEqual(4 * se)
        checks++
      })
      const median = year.percentiles.find(q => q.level === 0.5)!
      expect(Math.abs(median.value - mean)).toBeLessThan(4 * median.se + result.percentileResolution)
    }
    expect(checks).toBe(18)
  })

  it('stays normal when every component has its own anchor years (a rise formed from many basis columns)', () => {
    // Four releases on four different anchor grids: nine basis columns, so each year takes several passes.
    const input = baseInput({
      samples: 40_000,
      years: [2040, 2070, 2100],
      components: [
        normalComponent('ocean-expansion', { 2050: [0.1, 0.03], 2100: [0.3, 0.06] }),
        normalComponent('glaciers', { 2100: [0.1, 0.02] }),
        normalComponent('greenland', { 2040: [0.02, 0.01], 2080: [0.06, 0.03], 2100: [0.1, 0.05] }),
        normalComponent('antarctica', { 2060: [0.05, 0.02], 2100: [0.12, 0.08] }),
      ],
      landMotion: { rateMmPerYear: -1, sigmaMmPerYear: 0.5, epoch: 2000 },
      heights: [0.2, 0.5, 0.8],
      gumbel: { location: 1, scale: 0.1 },
    })
    const result = runOutlook(input)
    const year = result.byYear[2]!
    // 2100: means and sds straight from the releases; land motion 1 mm/yr ± 0.5 over 100 years
    const mean = 0.3 + 0.1 + 0.1 + 0.12 + 0.1
    const sd = Math.sqrt(0.06 ** 2 + 0.02 ** 2 + 0.05 ** 2 + 0.08 ** 2 + 0.05 ** 2)
    expect(Math.abs(year.mean.value - mean)).toBeLessThan(4 * year.mean.se)
    expect(year.sd).toBeCloseTo(sd, 2)
    result.heights.forEach((height, h) => {
      // reference library: jstat normal CDF [practice: sum of independent normals is normal]
      const p = 1 - jStat.normal.cdf(height, mean, sd)
      expect(Math.abs(year.exceedance[h]!.value - p)).toBeLessThanOrEqual(
        4 * Math.sqrt((p * (1 - p)) / input.samples) + 1e-12,
      )
    })
    // [memory] Hunter (2012), Climatic Change 113: allowance of a normal rise μ + σ²/(2λ)
    expect(Math.abs(year.gumbel!.allowance - (mean + sd ** 2 / 0.2))).toBeLessThan(0.01)
    expect(Object.values(year.varianceShare!).reduce((a, b) => a + b, 0)).toBeCloseTo(1, 10)
    // 2040: ocean expansion 0.8 of its 2050 level, antarctica 2/3 of its 2060 level, greenland at its anchor
    const early = result.byYear[0]!
    const earlyMean = 0.8 * 0.1 + 0.4 * 0.1 + 0.02 + (2 / 3) * 0.05 + 0.04
    expect(Math.abs(early.mean.value - earlyMean)).toBeLessThan(4 * early.mean.se)
  })

  it('samples a lognormal release: shift + exp(μ + σz), scaled, interpolated in time', () => {
    const input = baseInput({
      samples: 40_000,
      years: [2050, 2100],
      components: [
        {
          key: 'antarctica',
          scale: 2,
          release: {
            form: 'lognormal',
            baselineYear: 2000,
            anchorYears: [2100],
            shift: [-0.05],
            mu: [-2],
            sigma: [0.5],
          },
        },
      ],
      heights: [0.1, 0.2, 0.3, 0.5],
    })
    const result = runOutlook(input)
    const late = result.byYear[1]!
    result.heights.forEach((height, h) => {
      // reference library: jstat lognormal CDF; rise = 2 · (−0.05 + X), X lognormal(−2, 0.5)
      const p = 1 - jStat.lognormal.cdf(height / 2 + 0.05, -2, 0.5)
      expect(Math.abs(late.exceedance[h]!.value - p)).toBeLessThanOrEqual(
        4 * Math.sqrt((p * (1 - p)) / input.samples) + 1e-12,
      )
    })
    // [practice] lognormal mean exp(μ + σ²/2); 2050 is half way from zero at 2000
    const mean = 2 * (-0.05 + Math.exp(-2 + 0.125))
    expect(Math.abs(late.mean.value - mean)).toBeLessThan(4 * late.mean.se)
    expect(Math.abs(result.byYear[0]!.mean.value - mean / 2)).toBeLessThan(4 * result.byYear[0]!.mean.se)
  })

  it('reports the Monte Carlo standard error √(p(1−p)/N) with each probability', () => {
    const result = runOutlook(baseInput({ samples: 10_000 }))
    for (const estimate of result.byYear[1]!.exceedance) {
      expect(estimate.se).toBeCloseTo(Math.sqrt((estimate.value * (1 - estimate.value)) / 10_000), 12)
    }
  })
})

describe('published release check', () => {
  it('a quantile release from AR6 Table 9.9 (SSP5-8.5, 2100: 0.77 (0.63–1.01)) gives back its median and likely range', () => {
    // [pub] IPCC AR6 WG1 Table 9.9, global mean rise relative to 1995–2014 (baseline taken as 2005)
    const result = runOutlook({
      baselineYear: 2005,
      years: [2100],
      samples: 40_000,
      seed: 11,
      components: [
        {
          key: 'other',
          release: {
            form: 'quantiles',
            baselineYear: 2005,
            anchorYears: [2100],
            levels: [0.17, 0.5, 0.83],
            values: [[0.63, 0.77, 1.01]],
          },
        },
      ],
      heights: [0.5, 1],
    })
    const percentiles = Object.fromEntries(result.byYear[0]!.percentiles.map(p => [p.level, p]))
    for (const [level, value] of [
      [0.17, 0.63],
      [0.5, 0.77],
      [0.83, 1.01],
    ] as const) {
      // tolerance from CHECKS.md: Monte Carlo error plus 0.01 m for rounding
      expect(Math.abs(percentiles[level]!.value - value)).toBeLessThan(3 * percentiles[level]!.se + 0.01)
    }
  })

  it('SSP5-8.5 components in 2100 (ocean expansion, Greenland, Antarctica, land water) reproduce each median and range', () => {
    // [pub] IPCC AR6 WG1 Table 9.9 components, SSP5-8.5 2100
    const published = {
      'ocean-expansion': [0.24, 0.3, 0.36],
      'greenland': [0.09, 0.13, 0.18],
      'antarctica': [0.03, 0.12, 0.34],
      'land-water': [0.01, 0.03, 0.04],
    } as const
    for (const [key, values] of Object.entries(published)) {
      const result = runOutlook({
        baselineYear: 2005,
        years: [2100],
        samples: 20_000,
        seed: 3,
        components: [
          {
            key,
            release: {
              form: 'quantiles',
              baselineYear: 2005,
              anchorYears: [2100],
              levels: [0.17, 0.5, 0.83],
              values: [[...values]],
            },
          },
        ],
        heights: [0],
      })
      const [p17, p50, p83] = [0.17, 0.5, 0.83].map(level =>
        result.byYear[0]!.percentiles.find(p => p.level === level)!,
      )
      expect(Math.abs(p17!.value - values[0])).toBeLessThan(3 * p17!.se + 0.01)
      expect(Math.abs(p50!.value - values[1])).toBeLessThan(3 * p50!.se + 0.01)
      expect(Math.abs(p83!.value - values[2])).toBeLessThan(3 * p83!.se + 0.01)
    }
  })
})

describe('land motion', () => {
  const landOnly = (rate: number, sigma: number, epoch = 2020) =>
    runOutlook({
      baselineYear: 2020,
      years: [2020, 2100],
      samples: 20_000,
      seed: 5,
      components: [normalComponent('other', { 2100: [0, 0] }, 2020)],
      landMotion: { rateMmPerYear: rate, sigmaMmPerYear: sigma, epoch },
      heights: [0.2, 0.24, 0.3],
    })

  it('3 mm/yr of sinking over 80 years adds +0.24 m (not −0.24 m)', () => {
    // [practice] CHECKS.md land motion: −rate × (year − epoch) = +0.24 m
    const result = landOnly(-3, 0)
    expect(result.byYear[1]!.mean.value).toBeCloseTo(0.24, 10)
    expect(result.byYear[0]!.mean.value).toBe(0)
    expect(result.byYear[1]!.exceedance[0]!.value).toBe(1)
    expect(result.byYear[1]!.exceedance[2]!.value).toBe(0)
  })

  it('a rate σ of 0.5 mm/yr gives σ = 0.04 m over 80 years', () => {
    // [practice] CHECKS.md land motion: 0.5 mm/yr × 80 yr = 0.04 m
    const result = landOnly(-3, 0.5)
    // [analytic] the sample sd of N normal draws has standard error ≈ σ/√(2N); allow 4 of them.
    expect(Math.abs(result.byYear[1]!.sd - 0.04)).toBeLessThan(4 * 0.04 / Math.sqrt(2 * result.samples))
    expect(result.byYear[1]!.varianceShare!.other).toBe(0)
    expect(result.byYear[1]!.varianceShare!['land-motion']).toBeCloseTo(1, 12)
  })

  it('measures rise from the outlook baseline whatever the epoch of the rate', () => {
    // A constant rate contributes rate × (t − baseline) between the baseline and t; the epoch cancels.
    const a = landOnly(-3, 0.5, 2020)
    const b = landOnly(-3, 0.5, 2005)
    expect(landOnly(-3, 0, 2005).byYear[1]!.mean.value).toBeCloseTo(0.24, 10)
    expect(JSON.stringify(a.byYear)).toBe(JSON.stringify(b.byYear))
  })
})

describe('release baselines', () => {
  it('expresses rise relative to the outlook baseline along the same trajectory', () => {
    // release from 2000: 0.2 m in 2050 (sd 0) → 0.08 m at 2020; outlook from 2020 → 2050 shows 0.12 m
    const result = runOutlook(
      baseInput({
        baselineYear: 2020,
        years: [2020, 2050],
        components: [normalComponent('glaciers', { 2050: [0.2, 0] })],
      }),
    )
    expect(result.byYear[0]!.mean.value).toBe(0)
    expect(result.byYear[1]!.mean.value).toBeCloseTo(0.12, 12)
  })
})

describe('correlation', () => {
  const pair = (correlation: number[][]) =>
    runOutlook(
      baseInput({
        samples: 40_000,
        years: [2100],
        components: [
          normalComponent('ocean-expansion', { 2100: [0.3, 0.1] }),
          normalComponent('glaciers', { 2100: [0.2, 0.05] }),
        ],
        correlation,
      }),
    ).byYear[0]!

  it('perfectly correlated components give the sum of their quantiles', () => {
    // [practice] comonotone sums: each quantile of the sum is the sum of quantiles
    const year = pair([[1, 1], [1, 1]])
    const p95 = year.percentiles.find(p => p.level === 0.95)!
    expect(Math.abs(p95.value - (0.5 + 1.64485 * 0.15))).toBeLessThan(4 * p95.se + 0.001)
    expect(year.sd).toBeCloseTo(0.15, 2)
  })

  it('independent normal components give the root-sum-square spread', () => {
    // [practice] var of a sum of independent variables is the sum of variances
    const year = pair([[1, 0], [0, 1]])
    expect(year.sd).toBeCloseTo(Math.sqrt(0.1 ** 2 + 0.05 ** 2), 2)
    const share = year.varianceShare!
    expect(share['ocean-expansion']).toBeCloseTo(0.8, 1)
    expect(share.glaciers).toBeCloseTo(0.2, 1)
  })

  it('variance shares sum to one with correlation', () => {
    const share = pair([[1, 0.6], [0.6, 1]]).varianceShare!
    expect(Object.values(share).reduce((a, b) => a + b, 0)).toBeCloseTo(1, 10)
    // covariance allocation: (σ1² + ρσ1σ2) / (σ1² + σ2² + 2ρσ1σ2)
    expect(share['ocean-expansion']).toBeCloseTo((0.01 + 0.6 * 0.005) / (0.01 + 0.0025 + 2 * 0.6 * 0.005), 1)
  })
})

describe('reproducible and chunkable', () => {
  const input = baseInput({ samples: 5 * BLOCK_SIZE + 123, seed: 99, thresholds: [{ height: 0.3 }] })

  it('any split of blocks across threads gives bit-identical statistics', () => {
    const plan = planOutlook(input)
    const whole = runBlocks(plan, 0, plan.blockCount)
    const pieces = [runBlocks(plan, 4, 2), runBlocks(plan, 0, 1), runBlocks(plan, 1, 3)]
    const merged = mergePartials(plan, pieces)
    expect(Buffer.from(merged.blockSums.buffer).equals(Buffer.from(whole.blockSums.buffer))).toBe(true)
    expect(Buffer.from(merged.histogram.buffer).equals(Buffer.from(whole.histogram.buffer))).toBe(true)
    expect(Buffer.from(merged.cellCounts.buffer).equals(Buffer.from(whole.cellCounts.buffer))).toBe(true)
    const a = finishOutlook(plan, whole)
    const b = finishOutlook(plan, merged)
    const bytes = (result: typeof a) => Buffer.from(Float64Array.from(allNumbers(result)).buffer)
    expect(bytes(a).equals(bytes(b))).toBe(true)
  })

  it('gives the same bits whatever was sampled before on the same thread', () => {
    // The sample loop keeps its scratch and per-plan tables between calls; nothing may carry over.
    const plan = planOutlook(input)
    const first = finishOutlook(plan, runBlocks(plan, 0, plan.blockCount))
    const other = planOutlook({ ...input, seed: 5, thresholds: [{ height: 0.1 }] })
    runBlocks(other, 1, 3)
    const head = runBlocks(plan, 0, 2)
    runBlocks(other, 0, 1)
    const tail = runBlocks(plan, 2, plan.blockCount - 2)
    const again = finishOutlook(plan, mergePartials(plan, [head, tail]))
    const bytes = (result: typeof first) => Buffer.from(Float64Array.from(allNumbers(result)).buffer)
    expect(bytes(again).equals(bytes(first))).toBe(true)
  })

  it('the same seed gives the same bits and another seed other numbers', () => {
    expect(JSON.stringify(runOutlook(input))).toBe(JSON.stringify(runOutlook(input)))
    expect(JSON.stringify(runOutlook({ ...input, seed: 100 }))).not.toBe(JSON.stringify(runOutlook(input)))
  })

  it('refuses to finish without every block, and to merge overlapping runs', () => {
    const plan = planOutlook(input)
    expect(() => finishOutlook(plan, runBlocks(plan, 0, 2))).toThrow(/needs all 6 blocks/)
    expect(() => mergePartials(plan, [runBlocks(plan, 0, 2), runBlocks(plan, 1, 2)])).toThrow(
      /block 1 comes in two partials/,
    )
    expect(() => runBlocks(plan, 5, 2)).toThrow(RangeError)
  })

  it('threads claiming blocks from one counter, in whatever interleaving, give the same bits', () => {
    const plan = planOutlook(input)
    const whole = finishOutlook(plan, runBlocks(plan, 0, plan.blockCount))
    // Two "threads" share one counter; the slow one gets a single claim in while the fast one samples.
    let next = 0
    const claim = () => (next < plan.blockCount ? next++ : -1)
    const slowClaims: number[] = []
    const fast = runClaimedBlocks(plan, () => {
      const block = claim()
      if (block === 2) slowClaims.push(claim())
      return block
    })
    const slow = runClaimedBlocks(plan, () => slowClaims.shift() ?? -1)
    expect(Array.from(fast.blocks)).toEqual([0, 1, 2, 4, 5])
    expect(Array.from(slow.blocks)).toEqual([3])
    const again = finishOutlook(plan, mergePartials(plan, [slow, fast]))
    const bytes = (result: typeof whole) => Buffer.from(Float64Array.from(allNumbers(result)).buffer)
    expect(bytes(again).equals(bytes(whole))).toBe(true)
  })

  it('counts a year the same whether it shares a counting pass with another year or not', () => {
    const years = [2030, 2040, 2060, 2080, 2100]
    const input = baseInput({
      years,
      samples: 3 * BLOCK_SIZE + 7,
      components: [
        normalComponent('ocean-expansion', { 2050: [0.1, 0.03], 2100: [0.3, 0.08] }),
        normalComponent('glaciers', { 2050: [0.05, 0.02], 2100: [0.12, 0.04] }),
      ],
      landMotion: { rateMmPerYear: -2, sigmaMmPerYear: 0.5, epoch: 2000 },
      heights: { from: 0, to: 0.6, step: 0.02 },
    })
    // 2030 with 2040 and 2060 with 2080 are counted in pairs; 2100 alone.
    expect(samplerTables(planOutlook(input)).yearPairs.map(pair => [pair.first, pair.second])).toEqual([
      [0, 1],
      [2, 3],
    ])
    const together = runOutlook(input)
    years.forEach((year, t) => {
      const alone = runOutlook({ ...input, years: [year] })
      expect(alone.byYear[0]).toEqual(together.byYear[t])
    })
  })

  it('hands out each block of a shared counter once, whichever claim asks, then −1', () => {
    const counter = new Int32Array(new SharedArrayBuffer(Int32Array.BYTES_PER_ELEMENT))
    const one = claimFromCounter(counter, 3)
    const other = claimFromCounter(counter, 3)
    expect([one(), other(), one(), other(), one()]).toEqual([0, 1, 2, -1, -1])
  })

  it('refuses blocks out of order or outside the plan from a claim', () => {
    const plan = planOutlook(input)
    const handOut = (blocks: number[]) => () => blocks.shift() ?? -1
    expect(() => runClaimedBlocks(plan, handOut([2, 1]))).toThrow(/ascending order/)
    expect(() => runClaimedBlocks(plan, handOut([0, 0]))).toThrow(/ascending order/)
    expect(() => runClaimedBlocks(plan, handOut([6]))).toThrow(/block 6 is not a next block of this plan's 6/)
  })
})

describe('outputs', () => {
  it('finds trigger years per tolerance and "not within the horizon" as null', () => {
    const result = runOutlook(
      baseInput({
        years: [2030, 2050, 2075, 2100],
        thresholds: [{ key: 'road', height: 0.25 }, { key: 'wall', height: 5 }],
      }),
    )
    const road = result.thresholds[0]!
    // Trigger years are calendar years: an output year reaching the tolerance bounds the trigger from above.
    const probability = (year: number) => road.byYear[result.years.indexOf(year)]!.value
    for (const { tolerance, year } of road.triggerYears) {
      const decadal = result.years.find(y => probability(y) >= tolerance)
      if (year === null) expect(decadal).toBeUndefined()
      else if (decadal !== undefined) expect(year).toBeLessThanOrEqual(decadal)
    }
    expect(road.triggerYears.map(t => t.tolerance)).toEqual([0.01, 0.05, 0.1, 0.33, 0.5])
    // [practice] the median of the normal rise is its mean 0.1 + 0.004·(y − 2050) m, which passes 0.25 m
    // after 2087.5: 2088 (P ≈ 0.51, 3 SE above 50 % at 20k; 2087 is as far below).
    expect(road.triggerYears.find(t => t.tolerance === 0.5)!.year).toBe(2088)
    expect(result.thresholds[1]!.triggerYears.every(t => t.year === null)).toBe(true)
  })

  it('states the percentile resolution and never returns NaN', () => {
    const result = runOutlook(
      baseInput({
        years: [2000, 2050, 2100],
        gumbel: { location: 1, scale: 0.1 },
        thresholds: [{ height: 0.2 }, { kind: 'flood-level', height: 1.2, designLifeYears: 30, lifeStartYear: 2000 }],
      }),
    )
    expect(result.percentileResolution).toBe(0.001)
    expect(result.byYear[0]!.varianceShare).toBeNull()
    expect(result.byYear[0]!.percentiles.every(p => p.value === 0)).toBe(true)
    expect(result.thresholds[0]!.lifeExceedance).toBeNull()
    expect(result.thresholds[0]!.flood).toBeNull()
    expect(result.thresholds[1]!.lifeExceedance).not.toBeNull()
    expect(allNumbers(result).some(Number.isNaN)).toBe(false)
  })
})

describe('numerical edge cases', () => {
  it('variance shares sum to one when a part spreads by picometres around a level of 0.4 mm', () => {
    // A case fast-check found: covariances are taken about the all-scores-zero trajectory, so a tiny
    // spread next to a larger level does not cancel away. The lowest level sits 10 pm below the others
    // (fast-check's 2.5 pm gives a variance right at the no-spread limit of 1e-24 m², where whether
    // shares are reported at all depends on the draws).
    const flat = [-0.0004055197205340098, -0.0004055197205340098, -0.0004055197205340098, -0.0004055197205340098]
    const result = runOutlook(
      baseInput({
        baselineYear: 2020,
        years: [2020, 2100],
        samples: 3000,
        seed: 0,
        components: [
          {
            key: 'antarctica',
            release: {
              form: 'quantiles',
              baselineYear: 2020,
              anchorYears: [2100],
              levels: [0.05, 0.17, 0.5, 0.83, 0.95],
              values: [[-0.0004055197305340098, ...flat]],
            },
          },
          normalComponent('ocean-expansion', { 2100: [0, 0] }, 2020),
        ],
      }),
    )
    const share = result.byYear[1]!.varianceShare
    expect(share).not.toBeNull()
    expect(Object.values(share!).reduce((a, b) => a + b, 0)).toBeCloseTo(1, 12)
  })

  it('counts a rise equal to a height as not exceeding it, whatever histogram cell it falls in', () => {
    // Draws sit exactly on grid heights; P(rise > h) must be the share of draws strictly above h.
    const values = [0.1, 0.2, 0.3, 0.7, 0.75]
    const result = runOutlook(
      baseInput({
        baselineYear: 2000,
        years: [2100],
        samples: 30_000,
        components: [
          {
            key: 'glaciers',
            release: { form: 'samples', baselineYear: 2000, anchorYears: [2100], draws: values.map(v => [v]) },
          },
        ],
        heights: [0.1, 0.2, 0.3, 0.7, 0.75, 0.7500000001],
      }),
    )
    const year = result.byYear[0]!
    // Each draw is picked with probability 1/5, so counts above successive draws step down by ~1/5.
    const exceed = year.exceedance.map(e => e.value)
    expect(exceed[4]).toBe(0)
    expect(exceed[5]).toBe(0)
    for (let k = 0; k < 4; k++) expect(Math.abs(exceed[k]! - (4 - k) / 5)).toBeLessThan(4 * Math.sqrt(0.25 / 30_000))
    expect(year.mean.value).toBeCloseTo(0.41, 1)
  })
})
