import { describe, expect, it } from 'vitest'
import { gaugeUpdateChanges } from '../../../shared/briefing/gauge-staleness'
import { recordSince2020, smallOutlook } from '../../support/briefing-source'

// A small outlook (rise 0.5 ± 0.1 m by 2100, linear from 2020) weighted by 25 annual values 2020–2044
// rising at `rate`. The record reaches 2068 (as long after it as it spans), so the gauge section states
// 2050, the last output year it reaches; the threshold is at the outlook's 2050 median, 0.5·30/80 =
// 0.1875 m, an even chance there before any record.
const outlook = (rate?: number) => smallOutlook(rate === undefined ? undefined : recordSince2020(rate), 0.1875)

describe('what a new gauge record changes in a briefing\'s gauge section', () => {
  it('is nothing when the new outlook reads the same, or neither gives an update', () => {
    expect(gaugeUpdateChanges(outlook(0.006), outlook(0.006), 'en')).toEqual([])
    expect(gaugeUpdateChanges(outlook(), outlook(), 'en')).toEqual([])
    expect(gaugeUpdateChanges(outlook(0.1), outlook(), 'en')).toEqual([])
  })

  it('is each updated chance as new when the briefing gave no update and the latest outlook does', () => {
    // No record at issue, then one at 8 mm/yr (faster than the median 6.25 mm/yr): the 2050 chance of
    // passing the median is pulled above one half, and the briefing's readers have not been told.
    const [fromNone] = gaugeUpdateChanges(outlook(), outlook(0.008), 'en')
    expect(fromNone).toMatchObject({ thresholdId: 't1', kind: 'gauge-update-new', year: 2050, was: null })
    expect(fromNone!.now).toBeGreaterThan(0.5)
    // A record too unlike the trajectories at issue (refused), then one they can follow.
    const refused = outlook(0.1)
    expect(refused.observationUpdate!.refused).toBe(true)
    const [fromRefused] = gaugeUpdateChanges(refused, outlook(0.004), 'en')
    expect(fromRefused).toMatchObject({ kind: 'gauge-update-new', was: null })
    expect(fromRefused!.now).toBeLessThan(0.5)
  })

  it('is the chance updated by the record in the section\'s year when it reads differently', () => {
    // The outlook's median rate is 0.5 m / 80 yr = 6.25 mm/yr: a record at 4 mm/yr pulls the chance of
    // passing the 2050 median below one half, one at 8 mm/yr above it.
    const [change] = gaugeUpdateChanges(outlook(0.004), outlook(0.008), 'en')
    expect(change).toMatchObject({ thresholdId: 't1', kind: 'gauge-updated', year: 2050 })
    expect(change!.was).toBeLessThan(0.5)
    expect(change!.now).toBeGreaterThan(0.5)
  })

  it('says the update is no longer given when the new outlook has none, or refused it', () => {
    const gone = gaugeUpdateChanges(outlook(0.006), outlook(), 'en')
    expect(gone).toEqual([expect.objectContaining({ kind: 'gauge-update-gone', year: 2050, now: null })])
    // 10 cm a year: no trajectory of 0.5 ± 0.1 m by 2100 is anywhere near, so the update is refused.
    const far = outlook(0.1)
    expect(far.observationUpdate!.refused).toBe(true)
    expect(gaugeUpdateChanges(outlook(0.006), far, 'en')[0]).toMatchObject({ kind: 'gauge-update-gone', now: null })
    // A shorter record (2020–2024) reaches only to 2028: 2050 has no updated number any more.
    const short = smallOutlook({ ...recordSince2020(0.006), times: [2020.5, 2021.5, 2022.5, 2023.5, 2024.5],
      rise: [0.003, 0.009, 0.015, 0.021, 0.027] }, 0.1875)
    expect(gaugeUpdateChanges(outlook(0.006), short, 'en')[0]).toMatchObject({ kind: 'gauge-update-gone', now: null })
  })
})
