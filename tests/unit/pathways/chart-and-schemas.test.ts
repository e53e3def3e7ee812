import { describe, expect, it } from 'vitest'
import { pathwayChartLayout, pathwayChartSvg } from '../../../shared/pathways/chart'
import { pathwayDecisions } from '../../../shared/pathways/decisions'
import { MeasureSchema, PathwaySchema } from '../../../shared/pathways/schemas'

const tip = (year: number | null) => [
  { tolerance: 0.5, year, earliest: year, latest: year, resolution: 'annual' as const },
]
const scenarios = [
  { scenario: 'SSP1-2.6', horizon: 2150, tipping: { wall: tip(2080), raise: tip(null) } },
  { scenario: 'SSP5-8.5', horizon: 2150, tipping: { wall: tip(2050), raise: tip(2095) } },
]
const steps = [
  { measureId: 'wall', leadTimeYears: 0 },
  { measureId: 'raise', leadTimeYears: 30 },
  { measureId: 'retreat', leadTimeYears: 20 },
]
const measures = [
  { id: 'wall', name: 'Wall' },
  { id: 'raise', name: 'Raise <the> wall' },
  { id: 'retreat', name: 'Retreat' },
]

describe('the pathways chart layout', () => {
  const decisions = pathwayDecisions(steps, scenarios, [0.5], 2026)
  const layout = pathwayChartLayout({
    measures,
    scenarios: ['SSP1-2.6', 'SSP5-8.5'],
    decisions,
    startYear: 2020,
    endYear: 2150,
    currentYear: 2026,
  })

  it('gives each measure a lane per scenario from the tipping of the one before to its own', () => {
    expect(layout.rows[0]!.lanes.map(l => [l.from, l.to])).toEqual([[2020, 2080], [2020, 2050]])
    expect(layout.rows[1]!.lanes.map(l => [l.scenario, l.from, l.to])).toEqual([
      ['SSP1-2.6', 2080, null],
      ['SSP5-8.5', 2050, 2095],
    ])
    // Under SSP1-2.6 the raise does not tip by 2150, so retreat is not needed within the outlook.
    expect(layout.rows[2]!.lanes.map(l => l.scenario)).toEqual(['SSP5-8.5'])
  })

  it('marks decision years, late ones as such', () => {
    // [practice] 2080 − 30 = 2050, 2050 − 30 = 2020 (< 2026: late), 2095 − 20 = 2075.
    expect(layout.markers.map(m => [m.measure, m.scenario, m.year, m.late])).toEqual([
      ['Raise <the> wall', 'SSP1-2.6', 2050, false],
      ['Raise <the> wall', 'SSP5-8.5', 2020, true],
      ['Retreat', 'SSP5-8.5', 2075, false],
    ])
    // [practice] x is linear in the year: 2085 is halfway between 2020 and 2150.
    const mid = layout.left + (layout.plotRight - layout.left) / 2
    expect(
      pathwayChartLayout({
        measures,
        scenarios: ['SSP1-2.6'],
        decisions,
        startYear: 2020,
        endYear: 2150,
        currentYear: 2085,
      }).today!.x,
    ).toBeCloseTo(mid, 9)
  })

  it('draws every scenario as text beside its lane and escapes names', () => {
    const svg = pathwayChartSvg(layout, {
      title: 'Quay & harbour',
      today: 'Today',
      late: 'Late',
      decision: 'Decision',
      beyond: 'beyond',
      font: 'Atkinson Hyperlegible',
    })
    expect(svg).toContain('aria-label="Quay &amp; harbour"')
    expect(svg).toContain('Raise &lt;the&gt; wall')
    expect(svg.match(/>SSP5-8\.5</g)).toHaveLength(3)
    expect(svg).not.toContain('<the>')
  })
})

describe('what a planner enters', () => {
  it('refuses a negative lead time, saying what to fix', () => {
    const result = MeasureSchema.safeParse({ name: 'Gate', height: 1, leadTimeYears: -2 })
    expect(result.error!.issues[0]!.path).toEqual(['leadTimeYears'])
    expect(result.error!.issues[0]!.message).toMatch(/cannot be negative/)
  })

  it('refuses a pathway that returns to a measure (a cycle)', () => {
    const a = '00000000-0000-4000-8000-00000000000a'
    const b = '00000000-0000-4000-8000-00000000000b'
    const result = PathwaySchema.safeParse({ name: 'Loop', measureIds: [a, b, a] })
    expect(result.error!.issues[0]!.path).toEqual(['measureIds', 2])
    expect(result.error!.issues[0]!.message).toMatch(/already step 1/)
    expect(PathwaySchema.safeParse({ name: 'Line', measureIds: [a, b] }).data!.tolerances).toEqual([0.1, 0.5])
  })
})
