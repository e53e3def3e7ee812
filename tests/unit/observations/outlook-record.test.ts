import { describe, expect, it } from 'vitest'
import type { GaugeRecord } from '../../../shared/observations/gauge-record'
import { fitGaugeTrend, NODAL_PERIOD_YEARS } from '../../../shared/observations/gauge-trend'
import { observationsForOutlook } from '../../../shared/observations/outlook-record'

// A record 1980–2029 on a datum whose mean sea level at the 2000 epoch is 1.5 m: 3 mm/yr since 2000, a
// 2 cm nodal cycle and a small alternating wobble [practice: arithmetic]. Rise since the epoch is then
// height − 1.5 − nodal, whatever the fit makes of the wobble.
const nodal = (time: number) => 0.02 * Math.sin((2 * Math.PI * time) / NODAL_PERIOD_YEARS)
const record: GaugeRecord = {
  resolution: 'annual',
  values: Array.from({ length: 50 }, (_, i) => {
    const time = 1980.5 + i
    const height = 1.5 + 0.003 * (time - 2000) + nodal(time) + (i % 2 ? 0.004 : -0.004)
    return { year: 1980 + i, month: null, height, flag: null }
  }),
  gaps: [],
}
const fit = fitGaugeTrend(
  record.values.map(value => ({ time: value.year + 0.5, height: value.height })),
  'annual',
)

describe('observationsForOutlook', () => {
  it('gives the values since the epoch as rise above its mean sea level, the nodal cycle taken out', () => {
    const observed = observationsForOutlook(record, fit, 1.5, 2000, 2100)!
    expect(observed.times[0]).toBe(2000.5)
    expect(observed.times).toHaveLength(30)
    observed.times.forEach((time, i) => {
      const wobble = (time - 1980.5) % 2 ? 0.004 : -0.004
      // The fitted cycle is within a millimetre of the true one.
      expect(observed.rise[i]!).toBeCloseTo(0.003 * (time - 2000) + wobble, 3)
    })
    expect(observed).toMatchObject({ residualSd: fit.residualSd, phi: fit.phi, stepYears: 1 })
  })

  it('leaves flagged values and values past the outlook out, and gives nothing without a fit', () => {
    const flagged = { ...record, values: record.values.map((v, i) => (i === 25 ? { ...v, flag: 'suspect' } : v)) }
    const observed = observationsForOutlook(flagged, fit, 1.5, 2000, 2020)!
    expect(observed.times).not.toContain(2005.5)
    expect(observed.times.at(-1)).toBe(2019.5)
    expect(observationsForOutlook(record, null, 1.5, 2000, 2100)).toBeNull()
    expect(observationsForOutlook(record, fit, 1.5, 2040, 2100)).toBeNull()
  })
})
