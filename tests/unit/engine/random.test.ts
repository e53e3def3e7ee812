import { describe, expect, it } from 'vitest'
import jStatPkg from 'jstat'
import { blockStreamState, fillOpenUniforms, nextUint32, splitMix64 } from '../../../shared/engine/rng'
import { standardNormalCdf, standardNormalQuantile } from '../../../shared/engine'

const { jStat } = jStatPkg

describe('random streams', () => {
  it('xoshiro128** reproduces the reference output from state {1, 2, 3, 4}', () => {
    // [pub] reference vector of the xoshiro128starstar.c v1.1 authors' code, as used in the Rust rand_xoshiro tests
    const state = Uint32Array.from([1, 2, 3, 4])
    const outputs = Array.from({ length: 10 }, () => nextUint32(state))
    expect(outputs).toEqual([11520, 0, 5927040, 70819200, 2031721883, 1637235492, 1287239034, 3734860849, 3729100597, 4258142804])
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

  it('the bulk uniform filler follows the same stream as the single-step generator', () => {
    const a = blockStreamState(42, 3)
    const b = Uint32Array.from(a)
    const uniforms = new Float64Array(100)
    fillOpenUniforms(a, uniforms, 100)
    for (let i = 0; i < 100; i++) expect(uniforms[i]).toBe((nextUint32(b) + 0.5) / 4294967296)
    expect(Array.from(a)).toEqual(Array.from(b))
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
    for (const p of [0.01, 0.2, 0.5, 0.83, 0.99]) expect(standardNormalCdf(standardNormalQuantile(p))).toBeCloseTo(p, 12)
  })
})
