import { describe, expect, it } from 'vitest'
import { buildBriefingDocument } from '../../../shared/briefing/document'
import { recordSince2020, smallOutlook, testportSource } from '../../support/briefing-source'

// A small outlook (rise 0.5 ± 0.1 m by 2100, linear from 2020) weighted by a record since 2020.
const outlook = smallOutlook
const record = recordSince2020

function document(result: ReturnType<typeof outlook>, language: 'en' | 'es' = 'en') {
  const source = testportSource(result, 8192, { language, author: null })
  return buildBriefingDocument(source)
}

describe('the briefing section on the outlook updated by a gauge record', () => {
  it('is absent when the outlook was not weighted', () => {
    expect(document(outlook()).observationUpdate).toBeUndefined()
  })

  it('sets the updated range and chances beside the outlook\'s, with method, assumptions and limits', () => {
    // 4 mm/yr observed: slower than the outlook's median 6.25 mm/yr, so the updated range is lower.
    const section = document(outlook(record(0.004))).observationUpdate!
    expect(section.title).toMatch(/updated by the tide-gauge record/)
    expect(section.lines[0]).toMatch(/recorded 25 values from 2020 to 2044/)
    // Read as far ahead as it spans (2020–2044, so to 2068): the section states 2050, not 2100.
    expect(section.lines[1]).toMatch(/^The record is read in full to 2044, less each year after, and not at all from 2069/)
    expect(section.lines[2]).toMatch(/^In 2050, the likely range of rise \(17–83 %\) is .* in the outlook and .* updated/)
    expect(section.lines[3]).toMatch(/^Quay \(0\.50 m\): the chance .* in 2050 is .* in the outlook and .* updated/)
    expect(section.lines[4]).toMatch(/^Quay: the first year its chance reaches 10\s%/)
    expect(section.method.join(' ')).toMatch(/likelihood weighting.*Assumptions:.*Limits:/s)
    expect(document(outlook(record(0.004)), 'es').observationUpdate!.title).toMatch(/mareógrafo/)
  })

  it('says when every year of the outlook is beyond the record\'s reach, with no updated numbers', () => {
    // Five values 2020–2024 reach only to 2028, before the first output year after the baseline (2050).
    const short = { ...record(0.006), times: [2020.5, 2021.5, 2022.5, 2023.5, 2024.5] }
    const section = document(outlook({ ...short, rise: short.times.map(t => 0.006 * (t - 2020)) })).observationUpdate!
    expect(section.lines).toHaveLength(3)
    expect(section.lines[1]).toMatch(/not at all from 2029/)
    expect(section.lines[2]).toMatch(/beyond the record's reach, so the update changes none of its numbers/)
  })

  it('says the update was refused, with no updated numbers, when the record is far from every trajectory', () => {
    const section = document(outlook(record(0.05))).observationUpdate!
    expect(section.lines).toHaveLength(1)
    expect(section.lines[0]).toMatch(/^No update is given/)
  })
})
