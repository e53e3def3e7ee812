import { describe, expect, it } from 'vitest'
import { gaugeUpdateChanges } from '../../../shared/briefing/gauge-staleness'
import { recordSince2020, smallOutlook } from '../../support/briefing-source'

// A small outlook (rise 0.5 ± 0.1 m by 2100, linear from 2020; threshold 0.5 m, so an even chance in
// 2100 before any record) weighted by 25 annual values since 2020 rising at `rate`.
const outlook = (rate?: number) => smallOutlook(rate === undefined ? undefined : recordSince2020(rate))

describe('what a new gauge record changes in a briefing\'s gauge section', () => {
  it('is nothing when the briefing\'s outlook had no update, or the new one reads the same', () => {
    expect(gaugeUpdateChanges(outlook(), outlook(0.008), 'en')).toEqual([])
    expect(gaugeUpdateChanges(outlook(0.006), outlook(0.006), 'en')).toEqual([])
  })

  it('is the 2100 chance updated by the record when it reads differently', () => {
    // The outlook's median rate is 0.5 m / 80 yr = 6.25 mm/yr: a record at 4 mm/yr pulls the chance of
    // passing 0.5 m in 2100 below one half, one at 8 mm/yr above it.
    const [change] = gaugeUpdateChanges(outlook(0.004), outlook(0.008), 'en')
    expect(change).toMatchObject({ thresholdId: 't1', kind: 'gauge-updated', year: 2100 })
    expect(change!.was).toBeLessThan(0.5)
    expect(change!.now).toBeGreaterThan(0.5)
  })

  it('says the update is no longer given when the new outlook has none, or refused it', () => {
    const gone = gaugeUpdateChanges(outlook(0.006), outlook(), 'en')
    expect(gone).toEqual([expect.objectContaining({ kind: 'gauge-update-gone', year: 2100, now: null })])
    // 10 cm a year: no trajectory of 0.5 ± 0.1 m by 2100 is anywhere near, so the update is refused.
    const far = outlook(0.1)
    expect(far.observationUpdate!.refused).toBe(true)
    expect(gaugeUpdateChanges(outlook(0.006), far, 'en')[0]).toMatchObject({ kind: 'gauge-update-gone', now: null })
  })
})
