import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// Each site's planning scenario decides the headline that lists, the map and GIS exports show,
// whichever outlook ran last; and an outlook's CSV gives the stored numbers to the millimetre.

let server: RunningServer
let planner: ApiClient
let reader: ApiClient

const as = (email: string, password: string) => ApiClient.signedIn(server.url, email, password)

const SITE = {
  name: 'Planning Point', latitude: 47.81, longitude: -34.61,
  referenceLevel: 'Planning Point chart datum (test)', datum: { kind: 'chart', offset: 1.5 }, referenceEpoch: 2020,
  landMotion: { rateMmPerYear: -2, sigmaMmPerYear: 0.5, source: 'gps', reference: '', epoch: 2020 },
  thresholds: [{ label: 'Quay edge', height: 2.0 }, { label: '=HYPERLINK("http://example.invalid")', height: 2.6 }],
}

interface Listed {
  id: string
  name: string
  planning: { scenario: string, tolerance: number }
  planningOutlook: { id: string, scenario: string, headline: { probability: number } | null } | null
}

/** Parses the CSV the app writes (RFC 4180 quoting, CRLF rows). */
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

let siteId: string
let moderate: string
let high: string

beforeAll(async () => {
  server = await startServer()
  planner = await as(PLANNER.email, PLANNER.password)
  reader = await as(READER.email, READER.password)
  siteId = (await planner.post('/api/sites', SITE)).body.id
  moderate = (await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 }))
    .body.id
  // The higher scenario runs last: before planning scenarios, the list would have switched to it.
  high = (await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP5-8.5', samples: 20_000, seed: 7 })).body
    .id
})
afterAll(async () => { await server?.stop() })

const listed = async (api = planner) => ((await api.get('/api/sites')).body as Listed[]).find(s => s.id === siteId)!

describe('the planning scenario', () => {
  it('defaults to SSP2-4.5 at a 10 % tolerance, and the list shows that scenario\'s headline though another ran last', async () => {
    const site = await listed()
    expect(site.planning).toEqual({ scenario: 'SSP2-4.5', tolerance: 0.1 })
    expect(site.planningOutlook).toMatchObject({ id: moderate, scenario: 'SSP2-4.5' })
    // Readers see the same headline.
    expect((await listed(reader)).planningOutlook?.id).toBe(moderate)
    // The demo port plans for the high scenario.
    const port = await as(PORT_PLANNER.email, PORT_PLANNER.password)
    expect(
      ((await port.get('/api/sites')).body as Listed[]).find(s => s.name === 'Skerrow Quay')!.planning.scenario,
    ).toBe('SSP5-8.5')
  })

  it('is chosen by the planners in the site form and switches the headline to that scenario', async () => {
    const saved = await planner.patch(`/api/sites/${siteId}`, {
      ...SITE,
      planning: { scenario: 'SSP5-8.5', tolerance: 0.05 },
    })
    expect(saved.status).toBe(200)
    const site = await listed()
    expect(site.planning).toEqual({ scenario: 'SSP5-8.5', tolerance: 0.05 })
    expect(site.planningOutlook).toMatchObject({ id: high, scenario: 'SSP5-8.5' })
    // An edit that leaves the planning out keeps it.
    expect((await planner.patch(`/api/sites/${siteId}`, SITE)).status).toBe(200)
    expect((await listed()).planning.scenario).toBe('SSP5-8.5')
    // A scenario with no outlook yet leaves the headline empty rather than borrowing another scenario's.
    await planner.patch(`/api/sites/${siteId}`, { ...SITE, planning: { scenario: 'SSP1-2.6', tolerance: 0.1 } })
    expect((await listed()).planningOutlook).toBeNull()
    await planner.patch(`/api/sites/${siteId}`, { ...SITE, planning: { scenario: 'SSP2-4.5', tolerance: 0.1 } })
  })

  it.each([
    [
      'a tolerance the engine gives no trigger year for',
      { scenario: 'SSP2-4.5', tolerance: 0.2 },
      /^planning\.tolerance: Choose one of: 1 %, 5 %, 10 %, 33 %, 50 %\./,
    ],
    ['a scenario name with markup', { scenario: '<b>x</b>', tolerance: 0.1 }, /^planning\.scenario: /],
  ])('refuses %s, naming the field, and changes nothing', async (_name, planning, message) => {
    const response = await planner.patch(`/api/sites/${siteId}`, { ...SITE, planning })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(message)
    expect((await listed()).planning).toEqual({ scenario: 'SSP2-4.5', tolerance: 0.1 })
  })
})

describe('exports', () => {
  it('gives an outlook as CSV whose numbers match the stored outlook to the millimetre, with its provenance above them', async () => {
    const stored = (await planner.get(`/api/outlooks/${moderate}`)).body
    const response = await reader.fetchRaw(`/api/outlooks/${moderate}/csv`)
    expect(response.status).toBe(200)
    expect(response.headers.get('content-type')).toMatch(/^text\/csv/)
    expect(response.headers.get('content-disposition')).toMatch(
      /^attachment; filename="brinkwater-planning-point-ssp2-4.5-[0-9a-f]{8}\.csv"$/,
    )
    const rows = parseCsv(await response.text())
    const value = (key: string) => rows.find(r => r[0] === key)?.[1]
    expect(value('scenario')).toBe('SSP2-4.5')
    expect(value('datum')).toBe('Planning Point chart datum (test)')
    expect(value('datum kind')).toBe('chart')
    expect(value('mean sea level at the reference epoch above the datum (m)')).toBe('1.500')
    expect(value('reference epoch')).toBe('2020')
    expect(value('input hash')).toBe(stored.inputHash)
    for (const ref of stored.releaseRefs as { component: string, version: number }[])
      expect(rows.find(r => r[0] === `release ${ref.component}`)?.[1]).toBe(`v${ref.version}`)

    // Years × percentiles: each within half a millimetre of the stored value [practice: rounding to 0.001 m].
    const header = rows.findIndex(r => r[0] === 'year')
    const levels = stored.result.percentileLevels as number[]
    expect(rows[header]).toEqual(['year', 'mean (m)', ...levels.map(l => `p${Math.round(l * 100)} (m)`)])
    for (const [i, year] of (
      stored.result.byYear as {
        year: number
        mean: { value: number }
        percentiles: { level: number, value: number }[]
      }[]
    ).entries()) {
      const row = rows[header + 1 + i]!
      expect(Number(row[0])).toBe(year.year)
      expect(Math.abs(Number(row[1]) - year.mean.value)).toBeLessThanOrEqual(0.0005)
      levels.forEach((level, j) =>
        expect(Math.abs(Number(row[2 + j]) - year.percentiles.find(p => p.level === level)!.value)).toBeLessThanOrEqual(
          0.0005,
        ),
      )
    }
    // Thresholds × chances: heights above the datum (2.0 m as entered), chances as stored.
    const quay = rows.filter(r => r[0] === 'Quay edge')
    expect(quay).toHaveLength(stored.result.years.length)
    const index = stored.result.years.indexOf(2100)
    const row2100 = quay.find(r => r[3] === '2100')!
    expect(row2100[2]).toBe('2.000')
    expect(Math.abs(Number(row2100[4]) - stored.result.thresholds[0].byYear[index].value)).toBeLessThanOrEqual(0.00005)
    // A label a spreadsheet would run is quoted with an apostrophe [practice: OWASP CSV injection].
    expect(rows.filter(r => r[0] === '\'=HYPERLINK("http://example.invalid")')).toHaveLength(stored.result.years.length)
    expect(rows.some(r => r.some(cell => cell.startsWith('=')))).toBe(false)
  })

  it('gives the organisation\'s sites as RFC 7946 GeoJSON with each headline under the planning scenario', async () => {
    const response = await reader.fetchRaw('/api/exports/sites.geojson')
    expect(response.status).toBe(200)
    expect(response.headers.get('content-type')).toMatch(/^application\/geo\+json/)
    const collection = await response.json()
    expect(collection.type).toBe('FeatureCollection')
    // RFC 7946 §4: WGS 84 only, so no crs member; §3.1.1: [longitude, latitude].
    expect(collection).not.toHaveProperty('crs')
    const feature = collection.features.find((f: { id: string }) => f.id === siteId)
    expect(feature.geometry).toEqual({ type: 'Point', coordinates: [-34.61, 47.81] })
    const stored = (await planner.get(`/api/outlooks/${moderate}`)).body
    expect(feature.properties).toMatchObject({
      name: 'Planning Point',
      planningScenario: 'SSP2-4.5',
      planningTolerance: 0.1,
      outlookId: moderate,
      headlineThreshold: 'Quay edge',
      headlineHeightAboveDatumM: 2,
      headlineYear: 2100,
    })
    expect(Math.abs(feature.properties.headlineChance - stored.headline.probability)).toBeLessThanOrEqual(0.00005)
    const trigger = stored.result.thresholds[0].triggerYears.find(
      (t: { tolerance: number }) => t.tolerance === 0.1,
    ).year
    expect(feature.properties.triggerYearAtTolerance).toBe(trigger)
    // Only the caller's organisation's sites.
    const names = collection.features.map((f: { properties: { name: string } }) => f.properties.name)
    expect(names).toContain('Kelwick')
    expect(names).not.toContain('Skerrow Quay')
    for (const f of collection.features) expect(f.geometry.coordinates[0]).toBeLessThan(0)
  })

  it('answers 404 for an unknown outlook and 401 signed out', async () => {
    expect((await reader.get('/api/outlooks/00000000-0000-4000-8000-000000000000/csv')).status).toBe(404)
    expect((await new ApiClient(server.url).get(`/api/outlooks/${moderate}/csv`)).status).toBe(401)
  })
})
