import { describe, expect, it } from 'vitest'
import { outlookCsv, millimetres } from '../../../shared/exports/outlook-csv'
import { sitesGeoJson } from '../../../shared/exports/sites-geojson'
import { scenarioColour, SCENARIO_COLOURS } from '../../../shared/charts/scenario-colours'
import { runOutlook, type OutlookResult } from '../../../shared/engine'

// The export files: what a spreadsheet would run as a formula is quoted, numbers round to the
// millimetre, and GeoJSON follows RFC 7946 (lon/lat order, no crs member).

/** Parses the CSV the exporter writes (RFC 4180 quoting). */
function parseCsv(text: string): string[][] {
  const rows: string[][] = []
  let row: string[] = []
  let cell = ''
  let quoted = false
  for (let i = 0; i < text.length; i++) {
    const c = text[i]!
    if (quoted) {
      if (c === '"' && text[i + 1] === '"') { cell += '"'; i++ }
      else if (c === '"') quoted = false
      else cell += c
    }
    else if (c === '"') quoted = true
    else if (c === ',') { row.push(cell); cell = '' }
    else if (c === '\r' && text[i + 1] === '\n') { row.push(cell); rows.push(row); row = []; cell = ''; i++ }
    else cell += c
  }
  return rows
}

const result = runOutlook({
  baselineYear: 2020,
  years: [2020, 2050, 2100],
  samples: 4000,
  seed: 3,
  components: [
    {
      key: 'ocean-expansion',
      release: { form: 'normal', baselineYear: 2020, anchorYears: [2050, 2100], mean: [0.1, 0.4], sd: [0.02, 0.1] },
    },
  ],
  heights: [0, 0.5, 1],
  thresholds: [{ key: 't1', height: 0.3 }],
} as never) as OutlookResult

const META = {
  siteName: 'Harbour',
  scenario: 'SSP2-4.5',
  datum: { name: 'Chart datum', kind: 'chart', offset: 1.2, referenceEpoch: 2020 },
  samples: 4000,
  seed: 3,
  engineVersion: 'test',
  inputHash: 'abc123',
  finishedAt: null,
  releases: [{ component: 'ocean-expansion', version: 2, citation: 'Test citation', scale: 1 }],
  labels: { t1: 'Quay' },
}

describe('outlook CSV', () => {
  it('quotes every text cell a spreadsheet would run as a formula (= + - @ tab CR) and leaves numbers alone [practice: OWASP CSV injection]', () => {
    for (const hostile of ['=HYPERLINK("http://x")', '+1+1', '-2+3', '@SUM(A1)', '\tcmd', '\rcmd']) {
      const rows = parseCsv(outlookCsv({ ...META, siteName: hostile, labels: { t1: hostile } }, result))
      expect(rows.find(r => r[0] === 'site')![1]).toBe(`'${hostile}`)
      expect(rows.filter(r => r[1] === 'mean-sea-level').every(r => r[0] === `'${hostile}`)).toBe(true)
    }
    // A negative rise is a number, not a formula: it stays as written.
    expect(millimetres(-0.0049)).toBe('-0.005')
    const rows = parseCsv(outlookCsv(META, result))
    expect(rows.every(row => row.every(cell => !/^[=+@\t\r]/.test(cell) && !/^-[^\d]/.test(cell)))).toBe(true)
  })

  it('gives each year and percentile to the millimetre, with the datum, epoch, scenario, releases and hash above them [practice: arithmetic]', () => {
    const rows = parseCsv(outlookCsv(META, result))
    const value = (key: string) => rows.find(r => r[0] === key)?.[1]
    expect(value('scenario')).toBe('SSP2-4.5')
    expect(value('datum')).toBe('Chart datum')
    expect(value('reference epoch')).toBe('2020')
    expect(value('input hash')).toBe('abc123')
    expect(rows.find(r => r[0] === 'release ocean-expansion')).toEqual([
      'release ocean-expansion',
      'v2',
      'scale 1',
      'Test citation',
    ])
    const header = rows.findIndex(r => r[0] === 'year')
    for (const [i, year] of result.byYear.entries()) {
      const row = rows[header + 1 + i]!
      expect(Number(row[0])).toBe(year.year)
      for (const [j, level] of result.percentileLevels.entries()) {
        const stored = year.percentiles.find(p => p.level === level)!.value
        expect(Math.abs(Number(row[2 + j]) - stored)).toBeLessThanOrEqual(0.0005)
      }
    }
    // The threshold's height is given above the datum: 0.3 m above mean sea level + 1.2 m offset.
    expect(rows.find(r => r[0] === 'Quay' && r[3] === '2100')![2]).toBe('1.500')
  })
})

describe('sites GeoJSON', () => {
  it('is a FeatureCollection of [longitude, latitude] points without a crs member [pub: RFC 7946 §3.1.1, §4]', () => {
    const collection = sitesGeoJson([
      {
        site: {
          id: 's1',
          name: 'Kelwick',
          latitude: 47.62,
          longitude: -34.93,
          referenceLevel: 'MSL',
          referenceEpoch: 2020,
          planningScenario: 'SSP2-4.5',
          planningTolerance: 0.1,
        },
        outlook: {
          id: 'o1',
          inputHash: 'h',
          finishedAt: new Date('2026-01-01T00:00:00Z'),
          headline: {
            thresholdLabel: 'Quay',
            height: 0.5,
            year: 2100,
            probability: 0.1234,
            triggerYears: [{ tolerance: 0.1, year: 2090 }],
          },
        },
      },
    ])
    expect(collection.type).toBe('FeatureCollection')
    expect(collection).not.toHaveProperty('crs')
    expect(collection.features[0]!.geometry).toEqual({ type: 'Point', coordinates: [-34.93, 47.62] })
    expect(collection.features[0]!.properties).toMatchObject({
      planningScenario: 'SSP2-4.5',
      headlineChance: 0.1234,
      triggerYearAtTolerance: 2090,
    })
  })
})

describe('scenario colours', () => {
  it('give each scenario its own colour, the same whatever the order, with named storylines kept stable', () => {
    expect(new Set(Object.values(SCENARIO_COLOURS)).size).toBe(Object.keys(SCENARIO_COLOURS).length)
    expect(scenarioColour('SSP5-8.5')).toBe(SCENARIO_COLOURS['SSP5-8.5'])
    expect(scenarioColour('high-end-ice')).toBe(scenarioColour('high-end-ice'))
  })

  it('draw lines with at least 3:1 contrast against white [pub: WCAG 2.1 SC 1.4.11, relative luminance formula]', () => {
    const luminance = (hex: string) => {
      const [r, g, b] = [1, 3, 5]
        .map(i => Number.parseInt(hex.slice(i, i + 2), 16) / 255)
        .map(c => (c <= 0.03928 ? c / 12.92 : ((c + 0.055) / 1.055) ** 2.4))
      return 0.2126 * r! + 0.7152 * g! + 0.0722 * b!
    }
    for (const colour of Object.values(SCENARIO_COLOURS))
      expect(1.05 / (luminance(colour) + 0.05)).toBeGreaterThanOrEqual(3)
  })
})
