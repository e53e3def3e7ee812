import { describe, expect, it } from 'vitest'
import jStatPkg from 'jstat'
import { blockStreamState, nextUint32, splitMix64 } from '../../../shared/engine/rng'
import { fillNormalScores } from '../../../shared/engine/ziggurat'
import { standardNormalCdf, standardNormalQuantile } from '../../../shared/engine'

const { jStat } = jStatPkg

describe('random streams', () => {
  it('xoshiro128** reproduces the reference output from state {1, 2, 3, 4}', () => {
    // [pub] reference vector of the xoshiro128starstar.c v1.1 authors' code, as used in the Rust rand_xoshiro tests
    const state = Uint32Array.from([1, 2, 3, 4])
    const outputs = Array.from({ length: 10 }, () => nextUint32(state))
    expect(outputs).toEqual([
      11520, 0, 5927040, 70819200, 2031721883, 1637235492, 1287239034, 3734860849, 3729100597, 4258142804,
    ])
  })

  it('SplitMix64 reproduces its published first outputs from state 0', () => {
    // [pub] splitmix64.c (Vigna), seed 0: the values many test suites pin
    let state = 0n
    const outputs: bigint[] = []
    for (let i = 0; i < 3; i++) {
      const [next, output] = splitMix64(state)
      state = next
      outputs.push(output)
    }
    expect(outputs).toEqual([0xe220a8397b1dcdafn, 0x6e789e6aa1b965f4n, 0x06c45d188009454fn])
  })

  it('gives different blocks and seeds different streams', () => {
    expect(Array.from(blockStreamState(1, 0))).not.toEqual(Array.from(blockStreamState(1, 1)))
    expect(Array.from(blockStreamState(1, 0))).not.toEqual(Array.from(blockStreamState(2, 0)))
    expect(Array.from(blockStreamState(1, 5))).toEqual(Array.from(blockStreamState(1, 5)))
  })
})

describe('normal scores', () => {
  it('Φ⁻¹ matches the normal scores of CHECKS.md', () => {
    // [practice] CHECKS.md "Normal scores": Φ⁻¹(0.83) = 0.95417, Φ⁻¹(0.95) = 1.64485, Φ⁻¹(0.99) = 2.32635
    expect(standardNormalQuantile(0.83)).toBeCloseTo(0.95417, 5)
    expect(standardNormalQuantile(0.95)).toBeCloseTo(1.64485, 5)
    expect(standardNormalQuantile(0.99)).toBeCloseTo(2.32635, 5)
    // [practice] σ of a normal matching a likely range: (q83 − q17) / 1.90834
    expect(standardNormalQuantile(0.83) - standardNormalQuantile(0.17)).toBeCloseTo(1.90834, 4)
  })

  it('Φ⁻¹ agrees with jstat across the range and is odd', () => {
    for (const p of [1e-6, 0.001, 0.02, 0.1, 0.3, 0.5, 0.7, 0.9, 0.98, 0.999]) {
      // reference library: jstat normal inverse
      expect(standardNormalQuantile(p)).toBeCloseTo(jStat.normal.inv(p, 0, 1), 8)
      expect(standardNormalQuantile(1 - p)).toBeCloseTo(-standardNormalQuantile(p), 9)
    }
    expect(standardNormalQuantile(0)).toBe(-Infinity)
    expect(standardNormalQuantile(1)).toBe(Infinity)
  })

  it('Φ agrees with jstat and inverts Φ⁻¹', () => {
    for (const x of [-5, -2.5, -1, 0, 0.5, 1.96, 4]) {
      expect(standardNormalCdf(x)).toBeCloseTo(jStat.normal.cdf(x, 0, 1), 12)
    }
    for (const p of [0.01, 0.2, 0.5, 0.83, 0.99])
      expect(standardNormalCdf(standardNormalQuantile(p))).toBeCloseTo(p, 12)
  })
})

describe('ziggurat scores', () => {
  const DRAWS = 1_000_000
  const scores = new Float64Array(DRAWS)
  fillNormalScores(blockStreamState(20261202, 7), scores, 0, DRAWS)

  it('have the moments of a standard normal', () => {
    let sum = 0
    for (const x of scores) sum += x
    const mean = sum / DRAWS
    let m2 = 0
    let m3 = 0
    let m4 = 0
    for (const x of scores) {
      const d = x - mean
      m2 += d * d
      m3 += d * d * d
      m4 += d * d * d * d
    }
    m2 /= DRAWS
    m3 /= DRAWS
    m4 /= DRAWS
    // [formula] standard normal: mean 0, variance 1, skewness 0, kurtosis 3; sampling SEs of n draws
    // √(1/n), √(2/n), √(6/n), √(24/n); allowed 4 SE
    expect(Math.abs(mean)).toBeLessThan(4 * Math.sqrt(1 / DRAWS))
    expect(Math.abs(m2 - 1)).toBeLessThan(4 * Math.sqrt(2 / DRAWS))
    expect(Math.abs(m3 / m2 ** 1.5)).toBeLessThan(4 * Math.sqrt(6 / DRAWS))
    expect(Math.abs(m4 / m2 ** 2 - 3)).toBeLessThan(4 * Math.sqrt(24 / DRAWS))
  })

  it('fall beyond ±1, ±2, ±3, ±4 as often as the normal CDF says', () => {
    for (const cut of [-4, -3, -2, -1, 1, 2, 3, 4]) {
      // reference library: jstat normal CDF
      const expected = cut < 0 ? jStat.normal.cdf(cut, 0, 1) : 1 - jStat.normal.cdf(cut, 0, 1)
      let count = 0
      for (const x of scores) if (cut < 0 ? x < cut : x > cut) count++
      const se = Math.sqrt((expected * (1 - expected)) / DRAWS)
      expect(Math.abs(count / DRAWS - expected), `beyond ${cut}`).toBeLessThan(4 * se)
    }
  })

  it('pass a Kolmogorov–Smirnov test against the normal CDF, overall and in the tail past r', () => {
    const sorted = Float64Array.from(scores.subarray(0, 200_000)).sort()
    const n = sorted.length
    let distance = 0
    for (let i = 0; i < n; i++) {
      // reference library: jstat normal CDF
      const p = jStat.normal.cdf(sorted[i]!, 0, 1)
      distance = Math.max(distance, Math.abs(p - i / n), Math.abs((i + 1) / n - p))
    }
    // [formula] Kolmogorov's asymptotic critical value at the 0.1 % level: 1.95 / √n
    expect(distance).toBeLessThan(1.95 / Math.sqrt(n))
    // The tail beyond r = 3.6542 (Marsaglia's exponential rejection): conditional CDF against jstat's.
    const tail = Float64Array.from(scores.filter(x => Math.abs(x) > 3.6541528853610088), Math.abs).sort()
    const beyond = 1 - jStat.normal.cdf(3.6541528853610088, 0, 1)
    let tailDistance = 0
    for (let i = 0; i < tail.length; i++) {
      const p = 1 - (1 - jStat.normal.cdf(tail[i]!, 0, 1)) / beyond
      tailDistance = Math.max(tailDistance, Math.abs(p - i / tail.length), Math.abs((i + 1) / tail.length - p))
    }
    expect(tail.length).toBeGreaterThan(200)
    expect(tailDistance).toBeLessThan(1.95 / Math.sqrt(tail.length))
  })

  it('are symmetric: as many below −x as above x, strip by strip', () => {
    for (const x of [0, 0.5, 1.5, 2.5]) {
      let below = 0
      let above = 0
      for (const score of scores) {
        if (score < -x) below++
        else if (score > x) above++
      }
      // [formula] binomial with p = ½ given below + above: SE √(n)/2 on the difference of n/2
      expect(Math.abs(below - above)).toBeLessThan(4 * Math.sqrt(below + above))
    }
  })

  it('draw the same numbers in one call or many, whatever the rejections consumed', () => {
    const whole = new Float64Array(10_000)
    fillNormalScores(blockStreamState(5, 11), whole, 0, whole.length)
    const parts = new Float64Array(10_000)
    const state = blockStreamState(5, 11)
    for (const [at, count] of [
      [0, 1],
      [1, 2_499],
      [2_500, 7_000],
      [9_500, 500],
    ] as const)
      fillNormalScores(state, parts, at, count)
    expect(parts).toEqual(whole)
  })

  it('use about one 32-bit output per score: rejections are rare', () => {
    const state = blockStreamState(9, 0)
    const copy = Uint32Array.from(state)
    const count = 100_000
    fillNormalScores(state, new Float64Array(count), 0, count)
    let outputs = 0
    const same = () => copy[0] === state[0] && copy[1] === state[1] && copy[2] === state[2] && copy[3] === state[3]
    while (!same() && outputs < 2 * count) {
      nextUint32(copy)
      outputs++
    }
    // [formula] with Marsaglia and Tsang's 256 strips the fast path accepts Σ_i x_{i−1}/x_i / 256 ≈ 98.5 %
    // of words; a wedge or tail draw adds one to three outputs to the rest.
    expect(outputs / count).toBeGreaterThan(1.01)
    expect(outputs / count).toBeLessThan(1.04)
  })
})
