import { describe, expect, it } from 'vitest'
import { EXP_DOMAIN_LOW, expOfNonPositive } from '../../../shared/engine/exp'

// The weights' exponential against the platform's Math.exp (correctly rounded or within an ulp in V8's
// fdlibm port) and against exact powers of e that binary fractions give.

const ULP = 2 ** -52

describe('the exponential of the observation weights', () => {
  it('is within two units in the last place of Math.exp over its whole domain', () => {
    let state = 20261204
    let worst = 0
    for (let i = 0; i < 200_000; i++) {
      state = (Math.imul(state, 1664525) + 1013904223) >>> 0
      const x = (state / 2 ** 32) * EXP_DOMAIN_LOW * (i % 2 ? 1 : 1 / 16)
      const reference = Math.exp(x)
      worst = Math.max(worst, Math.abs(expOfNonPositive(x) - reference) / reference / ULP)
    }
    expect(worst).toBeLessThanOrEqual(2)
  })

  it('is exact where the exponential is: e⁰ = 1, and e^(m·ln 2) a power of two within an ulp', () => {
    expect(expOfNonPositive(0)).toBe(1)
    expect(expOfNonPositive(-0)).toBe(1)
    for (const m of [1, 2, 10, 52, 300, 1000]) {
      const x = -m * Math.LN2
      expect(Math.abs(expOfNonPositive(x) * 2 ** m - 1)).toBeLessThanOrEqual(2 * ULP * m)
    }
    expect(expOfNonPositive(EXP_DOMAIN_LOW)).toBeGreaterThan(0)
  })
})
