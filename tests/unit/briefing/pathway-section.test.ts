import { describe, expect, it } from 'vitest'
import { pathwaySection } from '#shared/briefing/pathway-section'
import { decisionSpread, pathwayDecisions } from '#shared/pathways/decisions'
import type { PathwaySnapshot } from '#shared/pathways/snapshot'

// Freezing a site's pathways into a briefing: what the section shows, in plain JSON, with the
// database's ids replaced by local keys used consistently across measures, steps and records.

const WALL = '11111111-1111-4111-8111-111111111111'
const RAISE = '22222222-2222-4222-8222-222222222222'
const PATHWAY = '33333333-3333-4333-8333-333333333333'
const RECORD = '44444444-4444-4444-8444-444444444444'
const REVIEW = '55555555-5555-4555-8555-555555555555'

const measure = (id: string, name: string, leadTimeYears: number) => ({
  id, name, height: 1, kind: 'mean-sea-level' as const, leadTimeYears, designLifeYears: null, costBand: null,
  createdBy: 'someone', createdAt: new Date('2026-01-01T00:00:00Z'),
})
const scenarios = [{ scenario: 'SSP2-4.5', horizon: 2150, tipping: { [WALL]: [{ tolerance: 0.1, year: 2060, earliest: 2058, latest: 2062, resolution: 'annual' }] } }]
const decisions = pathwayDecisions(
  [{ measureId: WALL, leadTimeYears: 0 }, { measureId: RAISE, leadTimeYears: 12 }],
  scenarios as never,
  [0.1],
  2026,
)
const record = (id: string, reviews: string | null) => ({
  id, pathwayId: PATHWAY, measureId: RAISE, fromMeasureId: WALL, scenario: 'SSP2-4.5', tolerance: 0.1,
  tippingYear: 2060, decisionYear: 2048, horizon: 2150, leadTimeYears: 12, rationale: 'Because.',
  outlookInputHash: 'abc', engineVersion: 'e1', decidedByName: 'Noor', decidedAt: new Date('2026-05-01T10:00:00Z'),
  reviewDate: '2031-01-01', reviewsRecordId: reviews,
  releases: [{ component: 'glaciers', version: 2, citation: 'c', releaseId: 'r', seriesId: 's' }],
})
const snapshot: PathwaySnapshot = {
  site: { referenceLevel: 'Chart datum', referenceEpoch: 2020 },
  currentYear: 2026,
  measures: [measure(WALL, 'Wall', 0), measure(RAISE, 'Raise', 12)],
  scenarios: [{ scenario: 'SSP2-4.5', horizon: 2150, inputHash: 'abc', releases: [] }],
  pathways: [{
    id: PATHWAY, name: 'Hold the line', illustrative: false, measureIds: [WALL, RAISE], tolerances: [0.1],
    decisions, spread: decisionSpread(decisions),
  }],
  records: [record(REVIEW, RECORD), record(RECORD, null)],
}

describe('a briefing\'s pathway section', () => {
  const section = pathwaySection(snapshot, '2026-06-01T09:00:00.000Z')

  it('names measures, pathways and records by local keys, the same wherever they appear', () => {
    expect(JSON.stringify(section)).not.toMatch(/[0-9a-f]{8}-[0-9a-f]{4}-/)
    expect(section.measures.map(m => [m.id, m.name])).toEqual([['m1', 'Wall'], ['m2', 'Raise']])
    expect(section.pathways[0]).toMatchObject({ id: 'p1', measureIds: ['m1', 'm2'] })
    expect(section.pathways[0]!.decisions[0]).toMatchObject({
      fromMeasureId: 'm1', toMeasureId: 'm2', tippingYear: 2060, decisionYear: 2048, alreadyLate: false,
    })
    expect(section.pathways[0]!.spread[0]).toMatchObject({ toMeasureId: 'm2', earliest: { year: 2048 } })
    expect(section.records.map(r => [r.id, r.pathwayId, r.measureId, r.fromMeasureId, r.reviewsRecordId])).toEqual([
      ['r1', 'p1', 'm2', 'm1', 'r2'],
      ['r2', 'p1', 'm2', 'm1', null],
    ])
  })

  it('keeps what the section shows and nothing of the live rows', () => {
    expect(section.asOf).toBe('2026-06-01T09:00:00.000Z')
    expect(section.records[0]!.decidedAt).toBe('2026-05-01T10:00:00.000Z')
    expect(section.records[0]!.releases).toEqual([{ component: 'glaciers', version: 2, citation: 'c' }])
    expect(Object.keys(section.measures[0]!)).not.toContain('createdBy')
    expect(JSON.parse(JSON.stringify(section))).toEqual(section)
  })
})
