import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, PLANNER, READER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { workSettled } from '../support/work'

// A site's land motion as posterior draws: versions, refusals that say what to fix, the outlook that
// samples them in place of the site's rate, and the briefing that says so.

let server: RunningServer
let planner: ApiClient
let reader: ApiClient
let siteId: string
let analyst: ApiClient
let reviewer: ApiClient

/** n draws with a long sinking tail: −2 − 6·(i/n)³ mm/yr, i = 1…n, listed last to first. */
function skewed(n = 200) {
  const rows = Array.from({ length: n }, (_, k) => n - k)
    .map(i => `${i},${(-2 - 6 * (i / n) ** 3).toFixed(4)}`)
  return `draw,rate_mm_per_year\n${rows.join('\n')}\n`
}

beforeAll(async () => {
  server = await startServer()
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  reader = await ApiClient.signedIn(server.url, READER.email, READER.password)
  const REVIEWER = demoUser('reviewer@saltglass.example')
  analyst = await ApiClient.signedIn(server.url, ANALYST.email, ANALYST.password)
  reviewer = await ApiClient.signedIn(server.url, REVIEWER.email, REVIEWER.password)
  siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Lowmere').id
})

afterAll(async () => {
  await server?.stop()
})

describe('land-motion draws', () => {
  it('keeps each upload as a version and summarises the latest', async () => {
    const none = (await reader.get(`/api/sites/${siteId}/land-motion-draws`)).body
    expect(none.latest).toBeNull()
    const first = await planner.post(`/api/sites/${siteId}/land-motion-draws`, { csv: skewed(150), source: 'gps' })
    expect(first.status).toBe(201)
    expect(first.body.version).toBe(1)
    const second = await planner.post(`/api/sites/${siteId}/land-motion-draws`, {
      csv: skewed(),
      source: 'insar',
      reference: 'Caldwyn InSAR 2015–2025',
    })
    expect(second.body.version).toBe(2)
    const read = (await reader.get(`/api/sites/${siteId}/land-motion-draws`)).body
    expect(read.versions.map((v: { version: number }) => v.version)).toEqual([2, 1])
    expect(read.latest).toMatchObject({ version: 2, source: 'insar', linkedRelease: null })
    // Draws −2 − 6(i/200)³: the median (type 7, between draws 100 and 101) is −2 − 6·0.5025³ ≈ −2.76.
    expect(read.latest.summary.count).toBe(200)
    expect(read.latest.summary.median).toBeCloseTo(-2 - 6 * ((100 / 200) ** 3 + (101 / 200) ** 3) / 2, 3)
    expect(read.latest.summary.p5).toBeLessThan(read.latest.summary.median)
    expect(read.latest.summary.draws).toBeUndefined()
  })

  it('refuses a file with the row and column to fix', async () => {
    const header = await planner.post(`/api/sites/${siteId}/land-motion-draws`, { csv: 'draw,rate\n1,2\n', source: 'gps' })
    expect(header.status).toBe(400)
    expect(header.body.data.issues[0]).toMatchObject({ field: 'csv header', code: 'landDrawsHeader' })
    const twice = skewed().replace('\n200,', '\n199,')
    const repeated = await planner.post(`/api/sites/${siteId}/land-motion-draws`, { csv: twice, source: 'gps' })
    expect(repeated.status).toBe(400)
    expect(repeated.body.data.issues[0]).toMatchObject({
      field: 'csv row 3, column draw',
      message: 'Draw 199 is also on row 2; give one rate per draw.',
    })
    const metres = skewed().replace(/\n1,[^\n]*/, '\n1,150')
    const outside = await planner.post(`/api/sites/${siteId}/land-motion-draws`, { csv: metres, source: 'gps' })
    expect(outside.body.data.issues[0].field).toBe('csv row 201, column rate_mm_per_year')
    expect(outside.body.data.issues[0].message).toContain('is outside -100 to 100 mm/yr')
  })

  it('refuses a link to a release the site\'s outlooks did not use', async () => {
    const linked = await planner.post(`/api/sites/${siteId}/land-motion-draws`, {
      csv: skewed(),
      source: 'gps',
      linkedReleaseId: '00000000-0000-4000-8000-000000000000',
    })
    expect(linked.status).toBe(400)
    expect(linked.body.data.issues).toEqual([{
      field: 'linkedReleaseId',
      message: 'linkedReleaseId: the release is not a release of draws used by this site\'s outlooks; choose one from the list, or none.',
    }])
  })

  it('samples the latest draws in the site\'s outlooks, and the briefing says so', async () => {
    const request = { scenario: 'SSP2-4.5', samples: 5_000, seed: 3 }
    const id = (await planner.post(`/api/sites/${siteId}/outlooks`, request)).body.id
    const outlook = (await planner.get(`/api/outlooks/${id}`)).body
    expect(outlook.input.landMotion.draws).toHaveLength(200)
    expect(outlook.input.landMotion.jointWith).toBeUndefined()
    expect(outlook.input.landMotionDraws).toMatchObject({ version: 2, source: 'insar', joint: null })

    const thresholdIds = (await planner.get(`/api/sites/${siteId}`)).body.thresholds.map((t: { id: string }) => t.id)
    const drafted = await planner.post('/api/briefings', { outlookId: id, title: 'Lowmere', thresholdIds, years: [2050] })
    expect(drafted.status).toBe(201)
    const basis = (await planner.get(`/api/briefings/${drafted.body.id}`)).body.document.basis
    expect(basis.landMotion).toContain('from 200 posterior draws of the rate')
    expect(basis.landMotion).toContain('sampled independently of every release')
  })

  it('lets only the site\'s planners upload', async () => {
    const refused = await reader.post(`/api/sites/${siteId}/land-motion-draws`, { csv: skewed(), source: 'gps' })
    expect(refused.status).toBe(403)
  })

  it('links the draws to a release of draws the site\'s outlooks use, draw j with draw j', async () => {
    // A new version of the glaciers series the site's outlooks adopted, given as 200 draws.
    const run = async (seed: number) => {
      const id = (await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 4_000, seed })).body.id
      return (await planner.get(`/api/outlooks/${id}`)).body
    }
    const before = await run(5)
    const glaciers = before.releaseRefs.find((ref: { component: string }) => ref.component === 'glaciers')
    const current = (await analyst.get(`/api/releases/${glaciers.releaseId}`)).body
    const anchors: number[] = current.anchorYears
    const rows = Array.from({ length: 200 }, (_, j) =>
      anchors.map((_, a) => (0.01 * (a + 1) * (1 + j / 200)).toFixed(4)))
    const csv = `${anchors.join(',')}\n${rows.map(row => row.join(',')).join('\n')}\n`
    const draft = await analyst.post('/api/releases', {
      seriesId: glaciers.seriesId,
      form: 'samples',
      baselineYear: current.baselineYear,
      csv,
      method: 'Joint fit test.',
      citation: 'Joint fit (2026).',
      licence: 'CC BY 4.0',
    })
    expect(draft.status, JSON.stringify(draft.body)).toBe(201)
    expect((await analyst.post(`/api/releases/${draft.body.id}/submit`)).status).toBe(200)
    expect((await reviewer.post(`/api/releases/${draft.body.id}/approve`)).status).toBe(200)
    expect((await run(6)).releaseRefs.find((ref: { component: string }) => ref.component === 'glaciers').releaseId)
      .toBe(draft.body.id)

    const offered = (await planner.get(`/api/sites/${siteId}/land-motion-draws`)).body.linkable
    expect(offered).toContainEqual(expect.objectContaining({ releaseId: draft.body.id, component: 'glaciers', draws: 200 }))
    const mismatch = await planner.post(`/api/sites/${siteId}/land-motion-draws`, {
      csv: skewed(150),
      source: 'gps',
      linkedReleaseId: draft.body.id,
    })
    expect(mismatch.status).toBe(400)
    expect(mismatch.body.data.issues[0].message).toContain('has 200 draws and the file 150')
    const linked = await planner.post(`/api/sites/${siteId}/land-motion-draws`, {
      csv: skewed(),
      source: 'model',
      linkedReleaseId: draft.body.id,
    })
    expect(linked.status).toBe(201)

    const joint = await run(7)
    expect(joint.input.landMotion.jointWith).toBe('glaciers')
    expect(joint.input.landMotionDraws.joint).toMatchObject({ component: 'glaciers', releaseId: draft.body.id })
    const thresholdIds = (await planner.get(`/api/sites/${siteId}`)).body.thresholds.map((t: { id: string }) => t.id)
    const drafted = await planner.post('/api/briefings', { outlookId: joint.id, title: 'Lowmere', thresholdIds, years: [2050] })
    const basis = (await planner.get(`/api/briefings/${drafted.body.id}`)).body.document.basis
    expect(basis.landMotion).toContain('is taken together with the draw of the same number of the')
  })

  it('brings the site\'s outlooks up to date with a new upload', async () => {
    const upload = await planner.post(`/api/sites/${siteId}/land-motion-draws`, { csv: skewed(300), source: 'gps' })
    expect(upload.status).toBe(201)
    expect(upload.body.updatingScenarios).toEqual(['SSP2-4.5'])
    await workSettled(server.url)
    const listed = (await planner.get(`/api/sites/${siteId}/outlooks`)).body as Array<{ id: string, scenario: string }>
    const newest = (await planner.get(`/api/outlooks/${listed.find(o => o.scenario === 'SSP2-4.5')!.id}`)).body
    expect(newest.input.landMotionDraws.version).toBe(upload.body.version)
    expect(newest.input.landMotion.draws).toHaveLength(300)
  })
})

// The file is parsed and checked on a worker thread (server/workers/land-motion-draws-worker.ts), in turn
// with release checks and within RELEASE_WORK_MS; what the planner sees is the same as for a small file.
describe('land-motion draws at the size limit', () => {
  const DRAWS = 100_000
  /** Draw k + 1 has rate −1 − k/n mm/yr, k = 0…n−1. */
  const rows = () => Array.from({ length: DRAWS }, (_, k) => `${k + 1},${(-1 - k / DRAWS).toFixed(5)}`)
  const csvOf = (lines: string[]) => `draw,rate_mm_per_year\n${lines.join('\n')}\n`
  /** A site of the planner's with no outlooks (until the first test asks for one). */
  const quietSite = async (api: ApiClient) =>
    ((await api.get('/api/sites')).body as Array<{ id: string, name: string }>).find(s => s.name !== 'Lowmere')!.id
  let quietSiteId: string

  beforeAll(async () => {
    quietSiteId = await quietSite(planner)
  })

  it('takes 100,000 draws and stores their summary', async () => {
    const stored = await planner.post(`/api/sites/${quietSiteId}/land-motion-draws`, { csv: csvOf(rows()), source: 'gps' })
    expect(stored.status, JSON.stringify(stored.body).slice(0, 300)).toBe(201)
    expect(stored.body.updatingScenarios).toEqual([])
    // [practice] rates −1 − k/n: mean and median −1 − (n − 1)/2n; the 5 % point (type 7) sits at sorted
    // index 0.05(n − 1) = 4999.95, which is k = n − 1 − 4999.95 = 94,999.05, i.e. −1 − 94,999.05/n.
    expect(stored.body.summary.count).toBe(DRAWS)
    expect(stored.body.summary.mean).toBeCloseTo(-1 - (DRAWS - 1) / (2 * DRAWS), 9)
    expect(stored.body.summary.median).toBeCloseTo(-1 - (DRAWS - 1) / (2 * DRAWS), 9)
    expect(stored.body.summary.p5).toBeCloseTo(-1 - 94_999.05 / DRAWS, 9)
    const read = (await reader.get(`/api/sites/${quietSiteId}/land-motion-draws`)).body
    expect(read.latest).toMatchObject({ version: stored.body.version, summary: stored.body.summary })

    // The outlook samples the stored rates, each at its draw number, as typed.
    const request = { scenario: 'SSP2-4.5', samples: 1_000, seed: 1 }
    const outlookId = (await planner.post(`/api/sites/${quietSiteId}/outlooks`, request)).body.id
    const draws: number[] = (await planner.get(`/api/outlooks/${outlookId}`)).body.input.landMotion.draws
    expect(draws).toHaveLength(DRAWS)
    expect([draws[0], draws[87_654], draws[DRAWS - 1]]).toEqual([-1, -1.87654, -1.99999])
  })

  it('names a bad row deep in a large file by its number, and keeps the version before it', async () => {
    const before = (await reader.get(`/api/sites/${quietSiteId}/land-motion-draws`)).body.latest.version
    const lines = rows()
    lines[87_653] = '87654,abc'
    const refused = await planner.post(`/api/sites/${quietSiteId}/land-motion-draws`, { csv: csvOf(lines), source: 'gps' })
    expect(refused.status).toBe(400)
    expect(refused.body.data.issues).toEqual([{
      field: 'csv row 87655, column rate_mm_per_year',
      code: 'notNumber',
      params: { cell: 'abc' },
      message: expect.stringContaining('abc'),
    }])
    expect(refused.body.message).toBe(`csv row 87655, column rate_mm_per_year: ${refused.body.data.issues[0].message}`)

    const tooMany = await planner.post(`/api/sites/${quietSiteId}/land-motion-draws`, {
      csv: csvOf([...rows(), `${DRAWS + 1},-1`]),
      source: 'gps',
    })
    expect(tooMany.status).toBe(400)
    expect(tooMany.body.data.issues[0]).toMatchObject({
      field: 'csv',
      code: 'tooManyDraws',
      params: { max: DRAWS, count: DRAWS + 1 },
    })
    expect((await reader.get(`/api/sites/${quietSiteId}/land-motion-draws`)).body.latest.version).toBe(before)
  })

  it('stops a check that runs past its time budget with a 503 that says what to do, and stores nothing', async () => {
    const hurried = await startServer({ RELEASE_WORK_MS: '1' })
    try {
      const api = await ApiClient.signedIn(hurried.url, PLANNER.email, PLANNER.password)
      const siteOfHurried = await quietSite(api)
      const answer = await api.post(`/api/sites/${siteOfHurried}/land-motion-draws`, { csv: csvOf(rows()), source: 'gps' })
      expect(answer.status).toBe(503)
      expect(answer.body.message).toMatch(/^Checking these land-motion draws took longer than .* so it was stopped\. Try again/)
      expect((await api.get(`/api/sites/${siteOfHurried}/land-motion-draws`)).body.latest).toBeNull()
    }
    finally {
      await hurried.stop()
    }
  })
})
