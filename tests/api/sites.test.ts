import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, PLANNER, PORT_PLANNER, READER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

let server: RunningServer
let planner: ApiClient
let reader: ApiClient
let portPlanner: ApiClient

const site = (overrides: Record<string, unknown> = {}) => ({
  name: 'Test Point',
  latitude: 48.1,
  longitude: -34.2,
  referenceLevel: 'Mean sea level 2020 at a test gauge',
  datum: { kind: 'mean-sea-level', offset: 0 },
  referenceEpoch: 2020,
  landMotion: { rateMmPerYear: -3, sigmaMmPerYear: 0.5, source: 'gps', reference: 'Test station', epoch: 2020 },
  thresholds: [{ label: 'Quay', height: 0.5 }, { label: 'Wall', height: 1.0 }],
  ...overrides,
})

const as = (email: string, password: string) => ApiClient.signedIn(server.url, email, password)

async function siteCount(api: ApiClient) {
  return (await api.get('/api/sites')).body.length
}

beforeAll(async () => {
  server = await startServer()
  planner = await as(PLANNER.email, PLANNER.password)
  reader = await as(READER.email, READER.password)
  portPlanner = await as(PORT_PLANNER.email, PORT_PLANNER.password)
})
afterAll(async () => { await server?.stop() })

describe('sites', () => {
  it('a planner registers a site; readers of the organisation read it; other organisations get 404', async () => {
    const created = await planner.post('/api/sites', site())
    expect(created.status).toBe(201)
    const id = created.body.id
    const read = await reader.get(`/api/sites/${id}`)
    expect(read.status).toBe(200)
    expect(read.body).toMatchObject({ name: 'Test Point', landMotionRate: -3, canEdit: false })
    expect(read.body.thresholds.map((t: { label: string }) => t.label)).toEqual(['Quay', 'Wall'])

    expect((await portPlanner.get(`/api/sites/${id}`)).status).toBe(404)
    expect((await portPlanner.patch(`/api/sites/${id}`, site({ name: 'Taken' }))).status).toBe(404)
    expect((await portPlanner.post(`/api/sites/${id}/outlooks`, { scenario: 'SSP2-4.5' })).status).toBe(404)
    expect((await portPlanner.get('/api/sites')).body.map((s: { id: string }) => s.id)).not.toContain(id)

    expect((await reader.post('/api/sites', site())).status).toBe(403)
    expect((await reader.patch(`/api/sites/${id}`, site())).status).toBe(403)
    expect((await reader.post(`/api/sites/${id}/outlooks`, { scenario: 'SSP2-4.5' })).status).toBe(403)
    expect((await new ApiClient(server.url).get('/api/sites')).status).toBe(401)
  })

  it('lists the demo towns of the organisation', async () => {
    const list = (await planner.get('/api/sites')).body
    const names = list.map((s: { name: string }) => s.name)
    expect(names).toEqual(expect.arrayContaining(['Kelwick', 'Drumhaven', 'Fennmouth', 'Lowmere', 'Saltcombe Ness']))
    expect(list.find((s: { name: string }) => s.name === 'Kelwick')).toMatchObject({
      thresholdCount: 2,
      hasExtremes: true,
      landMotionRate: -4.8,
    })
    expect(list.find((s: { name: string }) => s.name === 'Drumhaven')).toMatchObject({
      thresholdCount: 1,
      hasExtremes: false,
    })
    expect(names).not.toContain('Skerrow Quay')
  })

  it.each([
    ['latitude 91', site({ latitude: 91 }), /^latitude: The latitude must be at most 90 degrees/],
    [
      'no reference level',
      site({ referenceLevel: '' }),
      /^referenceLevel: Name the datum heights here are measured above/,
    ],
    [
      'a negative uncertainty',
      site({ landMotion: { rateMmPerYear: -3, sigmaMmPerYear: -1, source: 'gps', epoch: 2020 } }),
      /landMotion\.sigmaMmPerYear: The land-motion uncertainty must be at least 0/,
    ],
    [
      'an unknown source',
      site({ landMotion: { rateMmPerYear: -3, sigmaMmPerYear: 1, source: 'rumour', epoch: 2020 } }),
      /landMotion\.source: Choose one of: gps, insar, model, other/,
    ],
    [
      'a threshold without a name',
      site({ thresholds: [{ label: '', height: 1 }] }),
      /thresholds\.0\.label: Name the threshold/,
    ],
  ])('refuses %s with a message naming the field, and writes nothing', async (_name, body, message) => {
    const before = await siteCount(planner)
    const response = await planner.post('/api/sites', body)
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(message)
    expect(await siteCount(planner)).toBe(before)
  })
})

describe('two people editing one site', () => {
  it('refuses the later save made from an older version (412), keeping the first', async () => {
    const id = (await planner.post('/api/sites', site({ name: 'Shared Point' }))).body.id
    const opened = (await planner.get(`/api/sites/${id}`)).body.updatedAt as string
    const colleague = await as(PLANNER.email, PLANNER.password)
    const first = await colleague.request('PATCH', `/api/sites/${id}`, site({ name: 'Shared Point (colleague)' }), {
      headers: { 'if-match': `"${opened}"` },
    })
    expect(first.status).toBe(200)
    const second = await planner.request('PATCH', `/api/sites/${id}`, site({ name: 'Shared Point (mine)' }), {
      headers: { 'if-match': `"${opened}"` },
    })
    expect(second.status).toBe(412)
    expect(second.body.message).toMatch(/Someone saved changes to this site after you opened it\. Reload/)
    expect((await planner.get(`/api/sites/${id}`)).body.name).toBe('Shared Point (colleague)')
    // From the current version the save goes through.
    const current = (await planner.get(`/api/sites/${id}`)).body.updatedAt as string
    expect(
      (
        await planner.request('PATCH', `/api/sites/${id}`, site({ name: 'Shared Point (mine)' }), {
          headers: { 'if-match': `"${current}"` },
        })
      ).status,
    ).toBe(200)
    const garbled = await planner.request('PATCH', `/api/sites/${id}`, site(), {
      headers: { 'if-match': '"yesterday"' },
    })
    expect(garbled.status).toBe(400)
    expect(garbled.body.message).toMatch(/If-Match must be the site's updatedAt/)
  })
})

/**
 * A record of annual maxima rising 4 mm/yr from a Gumbel location of 1.5 m at 2020, scale 0.12 m (quantiles at spread
 * probabilities).
 */
function risingMaxima(years: number, start = 1990) {
  return Array.from({ length: years }, (_, i) => {
    const p = ((i * 7) % years + 0.5) / years
    return {
      year: start + i,
      value: Math.round((1.5 + 0.004 * (start + i - 2020) - 0.12 * Math.log(-Math.log(p))) * 1000) / 1000,
    }
  })
}
const maximaCsv = (rows: { year: number, value: number | string }[]) =>
  `year,value\n${rows.map(r => `${r.year},${r.value}`).join('\n')}\n`

describe('annual maxima', () => {
  it('fits a Gumbel whose location rises with the sea, reports it at the reference epoch with its trend and errors, and stores it', async () => {
    const id = (await planner.post('/api/sites', site({ name: 'Maxima Point' }))).body.id
    const fit = await planner.post(`/api/sites/${id}/annual-maxima`, { csv: maximaCsv(risingMaxima(30)) })
    expect(fit.status).toBe(200)
    expect(fit.body).toMatchObject({ sampleSize: 30, referenceEpoch: 2020 })
    // The record was built with a location of 1.5 m at 2020 rising 4 mm/yr [practice: the generating model];
    // the fit recovers them within two of its own standard errors.
    expect(Math.abs(fit.body.gumbel.trendPerYear - 0.004)).toBeLessThan(2 * fit.body.gumbel.se.trendPerYear)
    expect(Math.abs(fit.body.gumbel.location - 1.5)).toBeLessThan(2 * fit.body.gumbel.se.location)
    const stored = (await planner.get(`/api/sites/${id}`)).body
    expect(stored).toMatchObject({
      gumbelSource: 'fitted:30',
      gumbelLocation: fit.body.gumbel.location,
      gumbelTrend: fit.body.gumbel.trendPerYear,
    })
  })

  it.each([
    ['too few years', maximaCsv(risingMaxima(5)), /at least 20/i],
    ['centimetres', maximaCsv(risingMaxima(25).map(r => ({ ...r, value: Math.round(r.value * 100) }))), /centimetres/],
    ['an absurd value', maximaCsv(risingMaxima(25).map((r, i) => (i === 3 ? { ...r, value: 1e12 } : r))), /row 5/],
    ['a wrong header', 'when,level\n2001,1.2\n', /The header must be "year,value"/],
    [
      'a bad number',
      maximaCsv(risingMaxima(25).map((r, i) => (i === 4 ? { ...r, value: 'high' } : r))),
      /csv row 6, column value: "high" is not a finite number/,
    ],
    [
      'a repeated year',
      maximaCsv(risingMaxima(25).map((r, i) => (i === 3 ? { ...r, year: 1992 } : r))),
      /csv row 5, column year: 1992 appears twice/,
    ],
  ])(
    'refuses a CSV of maxima with %s, saying what to fix, and keeps the site as it was',
    async (_name, csv, message) => {
      const id = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Drumhaven').id
      const before = (await planner.get(`/api/sites/${id}`)).body
      const response = await planner.post(`/api/sites/${id}/annual-maxima`, { csv })
      expect(response.status).toBe(400)
      expect(response.body.message).toMatch(message)
      expect((await planner.get(`/api/sites/${id}`)).body).toEqual(before)
    },
  )
})

describe('datums, epochs and flood levels', () => {
  it.each([
    [
      'a datum without an offset',
      site({ datum: { kind: 'chart' } }),
      /^datum\.offset: Enter how many metres mean sea level/,
    ],
    ['no reference epoch', site({ referenceEpoch: undefined }), /^referenceEpoch: Enter the reference epoch/],
    [
      'a build year before the epoch',
      site({
        gumbel: { location: 1.5, scale: 0.12 },
        thresholds: [{ label: 'Wall', height: 2.3, kind: 'flood-level', buildYear: 2010, designLifeYears: 50 }],
      }),
      /thresholds\.0\.buildYear: The build year 2010 is before the reference epoch 2020/,
    ],
    [
      'a design life on a mean-sea-level threshold',
      site({ thresholds: [{ label: 'Wall', height: 1, designLifeYears: 30, buildYear: 2030 }] }),
      /belong to a flood level/,
    ],
    [
      'a flood level without extreme-water statistics',
      site({ thresholds: [{ label: 'Wall', height: 2.3, kind: 'flood-level' }] }),
      /needs the site's extreme-water statistics/,
    ],
  ])('refuses %s with a message that says what to fix, and stores nothing', async (_name, body, message) => {
    const before = (await planner.get('/api/sites')).body.length
    const response = await planner.post('/api/sites', body)
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(message)
    expect((await planner.get('/api/sites')).body.length).toBe(before)
  })

  it('counts rise from the reference epoch: an earlier epoch adds the rise since then, whatever year it is computed in', async () => {
    const thresholds = [{ label: 'Quay', height: 0.3 }]
    const base = (await planner.post('/api/sites', site({ name: 'Epoch 2020 Point', thresholds }))).body.id
    const later = (
      await planner.post(
        '/api/sites',
        site({
          name: 'Epoch 2030 Point',
          referenceEpoch: 2030,
          landMotion: { rateMmPerYear: -3, sigmaMmPerYear: 0.5, source: 'gps', reference: '', epoch: 2030 },
          thresholds,
        }),
      )
    ).body.id
    const run = async (id: string) =>
      (
        await planner.get(
          `/api/outlooks/${(await planner.post(`/api/sites/${id}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 })).body.id}`,
        )
      ).body
    const [a, b] = [await run(base), await run(later)]
    expect(a.result.years[0]).toBe(2020)
    expect(b.result.years[0]).toBe(2030)
    // The same height above mean sea level of 2020 is passed sooner than above that of 2030: the rise
    // 2020–2030 counts only from the earlier epoch [practice: rise is monotone in time for this science].
    const at2070 = (o: typeof a) => o.result.thresholds[0].byYear[o.result.years.indexOf(2070)].value
    expect(at2070(a)).toBeGreaterThan(at2070(b))
    expect(a.input.datum).toEqual({
      name: 'Mean sea level 2020 at a test gauge',
      kind: 'mean-sea-level',
      offset: 0,
      referenceEpoch: 2020,
    })
  })

  it('states a chart datum\'s heights through its offset: the same physical height gives the same chance', async () => {
    const thresholds = [{ label: 'Quay', height: 0.4 }]
    const above = (await planner.post('/api/sites', site({ name: 'Mean Sea Point', thresholds }))).body.id
    const chart = (
      await planner.post(
        '/api/sites',
        site({
          name: 'Chart Point',
          referenceLevel: 'Test chart datum',
          datum: { kind: 'chart', offset: 1.25 },
          thresholds: [{ label: 'Quay', height: 1.65 }],
        }),
      )
    ).body.id
    const run = async (id: string) =>
      (
        await planner.get(
          `/api/outlooks/${(await planner.post(`/api/sites/${id}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 })).body.id}`,
        )
      ).body
    const [a, b] = [await run(above), await run(chart)]
    // 1.65 m above a datum that mean sea level stands 1.25 m above is 0.40 m above mean sea level [practice:
    // arithmetic].
    expect(b.result.thresholds[0].height).toBeCloseTo(0.4, 12)
    expect(b.result.thresholds[0].byYear).toEqual(a.result.thresholds[0].byYear)
  })

  it('words a flood level by how often the water reaches it, never by the mean-sea-level chance', async () => {
    const id = (await planner.post('/api/sites', site({
      name: 'Flood Point', gumbel: { location: 1.55, scale: 0.14 },
      thresholds: [{ label: 'Sea wall crest', height: 2.3, kind: 'flood-level', buildYear: 2031, designLifeYears: 50 }],
    }))).body.id
    const outlook = (
      await planner.get(
        `/api/outlooks/${(await planner.post(`/api/sites/${id}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 })).body.id}`,
      )
    ).body
    const wall = outlook.result.thresholds[0]
    expect(wall.kind).toBe('flood-level')
    expect(wall.byYear).toEqual([])
    expect(wall.lifeStartYear).toBe(2031)
    expect(outlook.input.thresholds[0]).toMatchObject({ kind: 'flood-level', lifeStartYear: 2031, designLifeYears: 50 })
    // Today's chance of a 2.30 m water level with μ 1.55 m and λ 0.14 m is 1 − F(2.30) ≈ 0.47 % a year
    // [practice: Gumbel CDF]; over a 50-year life on a rising sea it is far from "exceptionally unlikely".
    expect(wall.flood.annualChance[0].value).toBeCloseTo(-Math.expm1(-Math.exp(-(2.3 - 1.55) / 0.14)), 2)
    expect(wall.lifeExceedance.value).toBeGreaterThan(0.5)
  })
})

describe('outlooks', () => {
  let siteId: string
  let outlookId: string

  beforeAll(async () => {
    siteId = (await planner.post('/api/sites', site({ name: 'Outlook Point' }))).body.id
  })

  it('computes an outlook with the latest published releases and stores what went in', async () => {
    const response = await planner.post(`/api/sites/${siteId}/outlooks`, {
      scenario: 'SSP2-4.5',
      samples: 20_000,
      seed: 7,
    })
    expect(response.status).toBe(201)
    expect(response.body.cached).toBe(false)
    outlookId = response.body.id
    const outlook = (await reader.get(`/api/outlooks/${outlookId}`)).body
    expect(outlook).toMatchObject({
      state: 'done',
      scenario: 'SSP2-4.5',
      samples: 20_000,
      seed: 7,
      engineVersion: expect.any(String),
    })
    expect(outlook.inputHash).toMatch(/^[0-9a-f]{64}$/)
    expect(outlook.releaseRefs.map((r: { component: string }) => r.component).sort()).toEqual([
      'antarctica',
      'glaciers',
      'greenland',
      'land-water',
      'ocean-expansion',
      'other',
      'regional-ocean',
    ])
    expect(outlook.releaseRefs.find((r: { component: string }) => r.component === 'greenland').version).toBe(2)
    expect(outlook.releaseRefs.find((r: { component: string }) => r.component === 'antarctica').scaleSource).toMatch(
      /fingerprint/,
    )
    // Notes are stored as facts, worded on the page in the reader's language.
    expect(outlook.notes).toContainEqual({ kind: 'unscaled', components: expect.arrayContaining(['glaciers']) })
    expect(outlook.notes).toContainEqual({ kind: 'uncorrelated', scenario: 'SSP2-4.5' })
    expect(outlook.result.thresholds).toHaveLength(2)
    expect((await reader.get(`/api/outlooks/${outlookId}/status`)).body.newerScience).toEqual([])
  })

  it('serves the same request from the store, and the same seed elsewhere gives the same numbers', async () => {
    const again = await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 })
    expect(again.status).toBe(200)
    expect(again.body).toEqual({ id: outlookId, cached: true })

    const twin = (await planner.post('/api/sites', site({ name: 'Twin Point' }))).body.id
    const twinOutlook = (
      await planner.post(`/api/sites/${twin}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 })
    ).body.id
    const [a, b] = await Promise.all([
      planner.get(`/api/outlooks/${outlookId}`),
      planner.get(`/api/outlooks/${twinOutlook}`),
    ])
    expect(b.body.result.byYear).toEqual(a.body.result.byYear)
    const other = (
      await planner.post(`/api/sites/${twin}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 8 })
    ).body.id
    expect((await planner.get(`/api/outlooks/${other}`)).body.result.byYear).not.toEqual(a.body.result.byYear)
  })

  it('notes a design life that ends past the releases, and gives no chance over it', async () => {
    const long = (
      await planner.post(
        '/api/sites',
        site({
          name: 'Long Life Point',
          gumbel: { location: 1.2, scale: 0.1 },
          thresholds: [
            {
              label: 'Sea wall for two centuries',
              height: 1.5,
              kind: 'flood-level',
              buildYear: 2030,
              designLifeYears: 200,
            },
          ],
        }),
      )
    ).body.id
    const id = (await planner.post(`/api/sites/${long}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 }))
      .body.id
    const outlook = (await planner.get(`/api/outlooks/${id}`)).body
    const lastYear = outlook.result.years.at(-1)
    expect(outlook.notes).toContainEqual({
      kind: 'life-beyond-releases',
      threshold: 'Sea wall for two centuries',
      lastYear,
    })
    expect(outlook.input.thresholds[0].designLifeYears).toBeUndefined()
  })

  it('sends a kept outlook as one JSON document whose length counts bytes, and the site as it is now in its status', async () => {
    const named = (await planner.post('/api/sites', site({ name: 'Pørt Ærwick – Ōtaki quay' }))).body.id
    const id = (await planner.post(`/api/sites/${named}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 }))
      .body.id
    const read = async () => {
      const response = await planner.request('GET', `/api/outlooks/${id}`, undefined, {
        headers: { 'accept-encoding': 'identity' },
      })
      expect(response.headers.get('content-type')).toMatch(/^application\/json/)
      expect(Number(response.headers.get('content-length'))).toBe(Buffer.byteLength(JSON.stringify(response.body)))
      return response.body
    }
    const status = async () => (await planner.get(`/api/outlooks/${id}/status`)).body
    const first = await read()
    expect(first).toMatchObject({ id, state: 'done' })
    expect(await status()).toMatchObject({
      state: 'done',
      progress: null,
      siteName: 'Pørt Ærwick – Ōtaki quay',
      newerScience: [],
    })
    // The stored outlook is kept after the first read; the site's own fields are read fresh every time.
    expect((await planner.patch(`/api/sites/${named}`, site({ name: 'Ōtaki quay' }))).status).toBe(200)
    expect((await status()).siteName).toBe('Ōtaki quay')
    expect((await read()).result).toEqual(first.result)
  })

  it('adds the land sinking to the rise: a sinking site is likelier to pass a height than a rising one', async () => {
    const sinking = (
      await planner.post(
        '/api/sites',
        site({ name: 'Sinking', landMotion: { rateMmPerYear: -8, sigmaMmPerYear: 0, source: 'model', epoch: 2020 } }),
      )
    ).body.id
    const rising = (
      await planner.post(
        '/api/sites',
        site({ name: 'Rising', landMotion: { rateMmPerYear: 8, sigmaMmPerYear: 0, source: 'model', epoch: 2020 } }),
      )
    ).body.id
    const chance = async (id: string) => {
      const outlookId = (
        await planner.post(`/api/sites/${id}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 3 })
      ).body.id
      const { result } = (await planner.get(`/api/outlooks/${outlookId}`)).body
      const year = result.years.indexOf(2100)
      return {
        p: result.thresholds[0].byYear[year].value,
        median: result.byYear[year].percentiles.find((q: { level: number }) => q.level === 0.5).value,
      }
    }
    const [down, up] = await Promise.all([chance(sinking), chance(rising)])
    expect(down.p).toBeGreaterThan(up.p)
    // [practice] 16 mm/yr between the two sites over the 80 years since the reference epoch 2020, same
    // scores (same seed): 1.28 m, whatever year the test runs in.
    expect(down.median - up.median).toBeCloseTo(0.016 * 80, 2)
  })

  it.each([
    ['0 samples', { scenario: 'SSP2-4.5', samples: 0 }, /^samples: Use at least 1,000 samples/],
    ['10⁹ samples', { scenario: 'SSP2-4.5', samples: 1e9 }, /^samples: Use at most 2,000,000 samples/],
    [
      'an unknown scenario',
      { scenario: 'SSP9-9.9' },
      /No published release for ocean-expansion, glaciers, .* under SSP9-9\.9/,
    ],
    ['a malformed scenario', { scenario: '<script>' }, /^scenario: Use 2–40 letters/],
  ])('refuses %s with a message and stores nothing', async (_name, body, message) => {
    const before = (await planner.get(`/api/sites/${siteId}/outlooks`)).body.length
    const response = await planner.post(`/api/sites/${siteId}/outlooks`, body)
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(message)
    expect((await planner.get(`/api/sites/${siteId}/outlooks`)).body.length).toBe(before)
  })

  it('names the component missing for a scenario', async () => {
    const analyst = await as(ANALYST.email, ANALYST.password)
    const reviewer = await as(demoUser('reviewer@saltglass.example').email, demoUser('reviewer@saltglass.example').password)
    const draft = await analyst.post('/api/releases', {
      series: { component: 'glaciers', scenario: 'high-end-ice', title: 'Storyline' },
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2150],
      mean: [0.3],
      sd: [0.05],
      method: 'm',
      citation: 'c',
      licence: 'l',
    })
    await analyst.post(`/api/releases/${draft.body.id}/submit`)
    await reviewer.post(`/api/releases/${draft.body.id}/approve`)
    const response = await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'high-end-ice' })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(
      /No published release for ocean-expansion, greenland, antarctica, land-water, regional-ocean, other under high-end-ice/,
    )
  })

  it('says when newer science is available, and recomputes the site with it in the background', async () => {
    const analyst = await as(ANALYST.email, ANALYST.password)
    const reviewer = await as(
      demoUser('reviewer@saltglass.example').email,
      demoUser('reviewer@saltglass.example').password,
    )
    const [glaciers] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP2-4.5&state=published')).body
    const next = await analyst.post('/api/releases', {
      seriesId: glaciers.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.06, 0.12, 0.17],
      sd: [0.01, 0.03, 0.04],
      method: 'm',
      citation: 'c',
      licence: 'l',
    })
    await analyst.post(`/api/releases/${next.body.id}/submit`)
    await reviewer.post(`/api/releases/${next.body.id}/approve`)

    const stale = (await planner.get(`/api/outlooks/${outlookId}/status`)).body
    expect(stale.newerScience).toEqual([
      {
        kind: 'new-version',
        component: 'glaciers',
        usedVersion: 1,
        latestVersion: 2,
        latestReleaseId: next.body.id,
        seriesTitle: 'Mountain glaciers (illustrative)',
      },
    ])
    expect(stale.offeredScience).toEqual([])
    // The publication queued a recomputation of every site with an SSP2-4.5 outlook, same samples and seed.
    const recomputed = await vi.waitFor(async () => {
      const list = (await planner.get(`/api/sites/${siteId}/outlooks`)).body as Array<{
        id: string
        scenario: string
        samples: number
        seed: number
        state: string
      }>
      const row = list.find(
        o =>
          o.id !== outlookId && o.scenario === 'SSP2-4.5' && o.samples === 20_000 && o.seed === 7 && o.state === 'done',
      )
      if (!row) throw new Error('not recomputed yet')
      return row
    }, { timeout: 20_000, interval: 100 })
    expect((await planner.get(`/api/outlooks/${recomputed.id}/status`)).body.newerScience).toEqual([])
    // Asking for it again finds the recomputed outlook in the store.
    const again = await planner.post(`/api/sites/${siteId}/outlooks`, {
      scenario: 'SSP2-4.5',
      samples: 20_000,
      seed: 7,
    })
    expect(again.status).toBe(200)
    expect(again.body.id).toBe(recomputed.id)
  })

  it('answers at once with 202 when asked not to wait', async () => {
    const response = await planner.post(`/api/sites/${siteId}/outlooks`, {
      scenario: 'SSP5-8.5',
      samples: 200_000,
      seed: 11,
      wait: false,
    })
    expect(response.status).toBe(202)
    expect(['running', 'done']).toContain((await planner.get(`/api/outlooks/${response.body.id}`)).body.state)
  })
})
