import { describe, expect, it } from 'vitest'
import { runOutlook } from '../../../shared/engine'
import { baseInput } from './helpers'

describe('rule of three on proportions of 0 or N', () => {
  const result = runOutlook(
    baseInput({ samples: 10_000, years: [2000, 2050, 2100], heights: [-0.5, 0.2, 3], thresholds: [{ height: 3 }] }),
  )
  const year = (y: number) => result.byYear[result.years.indexOf(y)]!

  it('bounds a chance counted as zero by 3/N', () => {
    // [practice, CHECKS.md "Rule of three"] zero events in N trials: one-sided 95 % upper bound ≈ 3/N.
    const never = year(2100).exceedance[2]!
    expect(never.value).toBe(0)
    expect(never.se).toBe(0)
    expect(never.upperBound95).toBeCloseTo(3 / 10_000, 15)
    expect(never.lowerBound95).toBeUndefined()
    expect(result.thresholds[0]!.byYear.every(estimate => estimate.upperBound95 === 3 / 10_000)).toBe(true)
  })

  it('bounds a chance counted as N by 1 − 3/N, and leaves other counts alone', () => {
    // [practice] the same rule for the complement: every sample of the rise is above −0.5 m.
    const always = year(2050).exceedance[0]!
    expect(always.value).toBe(1)
    expect(always.lowerBound95).toBeCloseTo(1 - 3 / 10_000, 15)
    expect(always.upperBound95).toBeUndefined()
    const some = year(2100).exceedance[1]!
    expect(some.value).toBeGreaterThan(0)
    expect(some.value).toBeLessThan(1)
    expect('upperBound95' in some || 'lowerBound95' in some).toBe(false)
  })
})
