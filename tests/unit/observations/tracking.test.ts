import { describe, expect, it } from 'vitest'
import { fitGaugeTrend, type GaugePoint } from '../../../shared/observations/gauge-trend'
import { trackAgainstOutlook } from '../../../shared/observations/tracking'

// A noiseless record rising 4 mm/yr, 1990–2029, so the fitted rise since a 2000 epoch is exact:
// 0.004 · (2029.5 − 2000) = 0.118 m at the last value [practice: arithmetic]. The tiny wobble keeps the
// residual variance above zero.
const record: GaugePoint[] = Array.from({ length: 40 }, (_, i) => ({
  time: 1990.5 + i,
  height: 1 + 0.004 * (1990.5 + i - 2000) + (i % 2 ? 1e-6 : -1e-6),
}))
const fit = fitGaugeTrend(record, 'annual')

describe('trackAgainstOutlook', () => {
  it('says within, above or below from the likely range at the last value', () => {
    const fanAround = (low: number, high: number) => [{ year: 2040, p17: low, p83: high }]
    // At 2029.5 the range is 29.5/40 of the 2040 range (linear from zero at the epoch).
    const within = trackAgainstOutlook(fit, 2000, 1, fanAround(0.1, 0.2))!
    expect(within.observed).toBeCloseTo(0.118, 6)
    expect(within.likelyLow).toBeCloseTo(0.1 * 29.5 / 40, 12)
    expect(within.status).toBe('within')
    expect(trackAgainstOutlook(fit, 2000, 1, fanAround(0.05, 0.1))!.status).toBe('above')
    expect(trackAgainstOutlook(fit, 2000, 1, fanAround(0.2, 0.3))!.status).toBe('below')
    expect(within.epochFrom).toBe('record')
  })

  it('refers to the datum offset when the epoch is before the record, and then names no side', () => {
    const late = record.filter(point => point.time > 2005)
    const lateFit = fitGaugeTrend(late, 'annual')
    const tracking = trackAgainstOutlook(lateFit, 2000, 1, [{ year: 2040, p17: 0.1, p83: 0.3 }])!
    expect(tracking.epochFrom).toBe('datum-offset')
    expect(tracking.observed).toBeCloseTo(0.118, 5)
    // 0.118 m lies inside 0.1–0.3 scaled to 2029.5, but the offset's own uncertainty is not in the ±, so
    // the comparison must not say "within" (nor above or below).
    expect(tracking.status).toBe('epoch-unobserved')
    expect(trackAgainstOutlook(lateFit, 2000, 1, [{ year: 2040, p17: 0.01, p83: 0.02 }])!.status).toBe(
      'epoch-unobserved',
    )
  })

  it('is too soon to tell within five years of the epoch, and silent past the outlook', () => {
    expect(trackAgainstOutlook(fit, 2026, 1, [{ year: 2040, p17: 0, p83: 1 }])!.status).toBe('too-soon')
    expect(trackAgainstOutlook(fit, 2000, 1, [{ year: 2020, p17: 0, p83: 1 }])).toBeNull()
  })
})
