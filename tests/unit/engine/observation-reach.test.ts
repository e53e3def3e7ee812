import { describe, expect, it } from 'vitest'
import { carriedShare, recordReach, runOutlook, type ObservationsInput, type OutlookResult } from '../../../shared/engine'
import { baseInput, normalComponent } from './helpers'

// How far ahead the record is read (shared/engine/observation-reach.ts): in full to its last value,
// tapering to the outlook's own numbers once as many years again have passed as it spans.

/** Thirty annual values 2000.5–2029.5 rising 4.5 mm/yr, faster than the outlook's median 3 mm/yr. */
const TIMES = Array.from({ length: 30 }, (_, i) => 2000.5 + i)
const RECORD = { times: TIMES, rise: TIMES.map(t => 0.0045 * (t - 2000)), residualSd: 0.02, phi: 0.3 }

function outlook(observations?: ObservationsInput): OutlookResult {
  return runOutlook(baseInput({
    // 2044: halfway from the record's last value (2029.5) to the end of its reach (2058.5).
    years: [2020, 2044, 2100],
    samples: 50_000,
    components: [normalComponent('ocean', { 2100: [0.3, 0.1] })],
    thresholds: [{ key: 'fifteen-centimetres', height: 0.15 }],
    ...(observations ? { observations } : {}),
  }))
}

function updated(result: OutlookResult) {
  const update = result.observationUpdate!
  if (update.refused) throw new Error(`update refused at ESS ${update.ess}`)
  return update
}

describe('how far ahead an observed record is read', () => {
  it('carries the record in full to its last value and none once as long again has passed', () => {
    const reach = recordReach({ firstTime: 2000.5, lastTime: 2029.5, reach: 'record-length' })
    expect(reach).toEqual({ mode: 'record-length', fullUntil: 2029.5, noneFrom: 2058.5 })
    expect(carriedShare(reach, 2029)).toBe(1)
    expect(carriedShare(reach, 2044)).toBeCloseTo(0.5, 12)
    expect(carriedShare(reach, 2058)).toBeCloseTo(0.5 / 29, 12)
    expect(carriedShare(reach, 2059)).toBe(0)
    const whole = recordReach({ firstTime: 2000.5, lastTime: 2029.5, reach: 'whole-outlook' })
    expect(carriedShare(whole, 2150)).toBe(1)
  })

  it('reads a record by default as far ahead as it spans: weighted, blended, then the outlook\'s own', () => {
    const plain = outlook()
    const tapered = updated(outlook(RECORD))
    const full = updated(outlook({ ...RECORD, reach: 'whole-outlook' }))
    expect(tapered.reach).toEqual({ mode: 'record-length', fullUntil: 2029.5, noneFrom: 2058.5 })
    expect(tapered.byYear.map(y => y.carried)).toEqual([1, 0.5, 0])

    // 2020, inside the record: the weighted numbers themselves.
    expect(tapered.byYear[0]).toEqual({ ...full.byYear[0], carried: 1 })
    expect(tapered.thresholds[0]!.byYear[0]).toEqual(full.thresholds[0]!.byYear[0])

    // 2100, out of reach: the outlook's own percentiles, mean and chance.
    tapered.byYear[2]!.percentiles.forEach((p, k) => expect(p.value).toBe(plain.byYear[2]!.percentiles[k]!.value))
    expect(tapered.byYear[2]!.mean.value).toBeCloseTo(plain.byYear[2]!.mean.value, 12)
    expect(tapered.byYear[2]!.sd).toBeCloseTo(plain.byYear[2]!.sd, 4)
    expect(tapered.thresholds[0]!.byYear[2]!.value).toBeCloseTo(plain.thresholds[0]!.byYear[2]!.value, 12)

    // 2044, halfway: a chance is the mean of the weighted and the outlook's (the record pulls it up), the
    // median lies between theirs, the mean is their mean.
    const weightedChance = full.thresholds[0]!.byYear[1]!.value
    const plainChance = plain.thresholds[0]!.byYear[1]!.value
    expect(weightedChance).toBeGreaterThan(plainChance + 0.1)
    expect(tapered.thresholds[0]!.byYear[1]!.value).toBeCloseTo((weightedChance + plainChance) / 2, 12)
    const median = (year: { percentiles: { level: number, value: number }[] }) =>
      year.percentiles.find(p => p.level === 0.5)!.value
    expect(median(tapered.byYear[1]!)).toBeGreaterThan(median(plain.byYear[1]!))
    expect(median(tapered.byYear[1]!)).toBeLessThan(median(full.byYear[1]!))
    const halfway = (full.byYear[1]!.mean.value + plain.byYear[1]!.mean.value) / 2
    expect(tapered.byYear[1]!.mean.value).toBeCloseTo(halfway, 12)

    // Trigger years: each year's blended chance lies between the weighted and the outlook's, so the first
    // year it reaches a tolerance lies between theirs (the chances rise year on year here).
    tapered.thresholds[0]!.triggerYears.forEach(({ tolerance, year }, k) => {
      const weighted = full.thresholds[0]!.triggerYears[k]!.year
      const own = plain.thresholds[0]!.triggerYears.find(entry => entry.tolerance === tolerance)!.year
      expect(weighted).not.toBeNull()
      expect(own).not.toBeNull()
      expect(year).toBeGreaterThanOrEqual(Math.min(weighted!, own!))
      expect(year).toBeLessThanOrEqual(Math.max(weighted!, own!))
    })
  })
})
