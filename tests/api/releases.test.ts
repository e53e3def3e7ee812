import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ADMIN, ANALYST, OPERATOR, PLANNER, READER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

const REVIEWER = demoUser('reviewer@saltglass.example')
let server: RunningServer
let author: ApiClient
let reviewer: ApiClient
let outsider: ApiClient
const anonymous = () => new ApiClient(server.url)

const QUANTILE_CSV = 'level,2050,2100\n0.05,0.02,0.05\n0.17,0.03,0.08\n0.5,0.05,0.12\n0.83,0.07,0.17\n0.95,0.09,0.22\n'
const provenance = {
  method: 'Test posterior from a statistical model of altimetry.',
  citation: 'Test group (2026).',
  licence: 'CC BY 4.0',
}

const as = (email: string, password: string) => ApiClient.signedIn(server.url, email, password)

beforeAll(async () => {
  server = await startServer()
  author = await as(ANALYST.email, ANALYST.password)
  reviewer = await as(REVIEWER.email, REVIEWER.password)
  // An analyst of another organisation, to prove drafts stay inside their own.
  const admin = await as(ADMIN.email, ADMIN.password)
  const council = (await admin.get('/api/organisations')).body.find((org: { kind: string }) => org.kind === 'council')
  await admin.post('/api/admin/users', {
    email: 'analyst@caldwyn.example',
    name: 'Council Analyst',
    role: 'analyst',
    organisationId: council.id,
    password: 'quay-lantern-harbour',
  })
  outsider = await as('analyst@caldwyn.example', 'quay-lantern-harbour')
})
afterAll(async () => { await server?.stop() })

describe('publishing a release', () => {
  it('walks draft → in review → published → superseded by version 2, with every step audited', async () => {
    const created = await author.post('/api/releases', {
      series: { component: 'glaciers', scenario: 'SSP2-4.5', title: 'Glacier posterior (test)' },
      form: 'quantiles',
      baselineYear: 2020,
      csv: QUANTILE_CSV,
      ...provenance,
    })
    expect(created.status).toBe(201)
    expect(created.body).toMatchObject({ version: 1, state: 'draft' })
    const v1 = created.body.id

    // A draft is invisible outside its organisation and to the public.
    expect((await outsider.get(`/api/releases/${v1}`)).status).toBe(404)
    expect((await anonymous().get(`/api/releases/${v1}`)).status).toBe(404)
    expect(
      (await anonymous().get('/api/releases?component=glaciers&scenario=SSP2-4.5')).body.map(
        (r: { id: string }) => r.id,
      ),
    ).not.toContain(v1)

    expect((await author.post(`/api/releases/${v1}/submit`)).body.state).toBe('in-review')
    const own = await author.post(`/api/releases/${v1}/approve`)
    expect(own.status).toBe(403)
    expect(own.body.message).toMatch(/another analyst must review/)
    expect((await author.get(`/api/releases/${v1}`)).body.actions).toEqual(['return'])
    expect((await reviewer.get(`/api/releases/${v1}`)).body.actions).toEqual(['approve', 'return'])
    expect((await reviewer.post(`/api/releases/${v1}/approve`)).body.state).toBe('published')

    const published = await anonymous().get(`/api/releases/${v1}`)
    expect(published.status).toBe(200)
    expect(published.body).toMatchObject({
      state: 'published',
      reviewerName: REVIEWER.name,
      authorName: ANALYST.name,
      citation: provenance.citation,
    })
    expect(published.body.distribution).toEqual({
      form: 'quantiles', baselineYear: 2020, anchorYears: [2050, 2100], levels: [0.05, 0.17, 0.5, 0.83, 0.95],
      values: [[0.02, 0.03, 0.05, 0.07, 0.09], [0.05, 0.08, 0.12, 0.17, 0.22]],
    })
    // The stored bands come from the engine: the table's own median and likely range, within sampling error.
    const at2100 = published.body.summary.find((row: { year: number }) => row.year === 2100)
    expect(at2100.p50).toBeCloseTo(0.12, 2)
    expect(at2100.p17).toBeCloseTo(0.08, 2)
    expect(at2100.p83).toBeCloseTo(0.17, 2)

    const second = await author.post('/api/releases', {
      seriesId: created.body.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100],
      mean: [0.05, 0.13],
      sd: [0.015, 0.04],
      ...provenance,
    })
    expect(second.body).toMatchObject({ version: 2, state: 'draft' })
    const third = await author.post('/api/releases', {
      seriesId: created.body.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2100],
      mean: [0.1],
      sd: [0.01],
      ...provenance,
    })
    expect(third.status).toBe(409)
    expect(third.body.message).toMatch(/Version 2 of this series is still a draft/)

    await author.post(`/api/releases/${second.body.id}/submit`)
    await reviewer.post(`/api/releases/${second.body.id}/approve`)
    expect((await anonymous().get(`/api/releases/${v1}`)).body.state).toBe('superseded')
    const history = await anonymous().get(`/api/series/${created.body.seriesId}`)
    expect(history.body.versions.map((v: { version: number, state: string }) => [v.version, v.state])).toEqual([
      [2, 'published'],
      [1, 'superseded'],
    ])
    const listed = (await anonymous().get('/api/releases?component=glaciers&scenario=SSP2-4.5')).body.filter(
      (r: { seriesId: string }) => r.seriesId === created.body.seriesId,
    )
    expect(listed.map((r: { version: number }) => r.version)).toEqual([2])

    const operator = await as(OPERATOR.email, OPERATOR.password)
    const actions = (await operator.get('/api/admin/audit?limit=50')).body
      .filter((entry: { targetId: string }) => [v1, second.body.id].includes(entry.targetId))
      .map((entry: { action: string }) => entry.action)
    expect(actions).toEqual(
      expect.arrayContaining(['release.drafted', 'release.submitted', 'release.published', 'release.superseded']),
    )
  })

  it('refuses approval by a colleague who edited the draft: they are one of its authors', async () => {
    const draft = (
      await author.post('/api/releases', {
        series: { component: 'greenland', scenario: 'SSP2-4.5', title: 'Greenland posterior (two people)' },
        form: 'normal',
        unit: 'mm',
        baselineYear: 2020,
        anchorYears: [2100],
        mean: [40],
        sd: [10],
        ...provenance,
      })
    ).body
    // The colleague rewrites the content and the method, then tries to publish it alone.
    const edited = await reviewer.request('PATCH', `/api/releases/${draft.id}`, {
      form: 'normal',
      unit: 'mm',
      baselineYear: 2020,
      anchorYears: [2100],
      mean: [400],
      sd: [1],
      ...provenance,
      method: 'Changed by the reviewer.',
    })
    expect(edited.status).toBe(200)
    expect((await reviewer.post(`/api/releases/${draft.id}/submit`)).status).toBe(200)
    expect((await reviewer.get(`/api/releases/${draft.id}`)).body.actions).toEqual(['return'])
    const refused = await reviewer.post(`/api/releases/${draft.id}/approve`)
    expect(refused.status).toBe(403)
    expect(refused.body.message).toMatch(/You changed this version's content, so you are one of its authors/)
    // The original author may not approve either; the release stays in review for a third analyst.
    expect((await author.post(`/api/releases/${draft.id}/approve`)).status).toBe(403)
    expect((await author.get(`/api/releases/${draft.id}`)).body.state).toBe('in-review')
  })

  it('keeps other organisations out of drafts: they cannot see, edit, submit or approve them', async () => {
    const draft = (
      await author.post('/api/releases', {
        series: { component: 'other', scenario: 'SSP1-2.6', title: 'Private draft (test)' },
        form: 'normal',
        baselineYear: 2020,
        anchorYears: [2100],
        mean: [0.01],
        sd: [0.005],
        ...provenance,
      })
    ).body
    expect(
      (
        await outsider.request('PATCH', `/api/releases/${draft.id}`, {
          form: 'normal',
          baselineYear: 2020,
          anchorYears: [2100],
          mean: [9],
          sd: [1],
          ...provenance,
        })
      ).status,
    ).toBe(404)
    expect((await outsider.post(`/api/releases/${draft.id}/submit`)).status).toBe(404)
    expect((await outsider.get(`/api/releases/${draft.id}/csv`)).status).toBe(404)
    expect((await outsider.get(`/api/series/${draft.seriesId}`)).status).toBe(404)
    expect((await outsider.get('/api/releases')).body.map((r: { id: string }) => r.id)).not.toContain(draft.id)
    expect((await reviewer.get('/api/releases?state=draft')).body.map((r: { id: string }) => r.id)).toContain(draft.id)
  })

  it.each([PLANNER, READER])('refuses to let a $role create or review releases (403)', async (demo) => {
    const api = await as(demo.email, demo.password)
    const create = await api.post('/api/releases', {
      series: { component: 'glaciers', scenario: 'SSP2-4.5', title: 'Nope' },
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2100],
      mean: [0.1],
      sd: [0.01],
      ...provenance,
    })
    expect(create.status).toBe(403)
    const [any] = (await api.get('/api/releases')).body
    expect((await api.post(`/api/releases/${any.id}/withdraw`, { reason: 'x' })).status).toBe(403)
  })

  it('asks anonymous callers to sign in before anything else', async () => {
    expect((await anonymous().post('/api/releases', {})).status).toBe(401)
    expect((await anonymous().post('/api/releases/preview', {})).status).toBe(401)
  })

  it('edits only drafts, and withdraws a published release only with a reason, shown wherever it is read', async () => {
    const draft = (
      await author.post('/api/releases', {
        series: { component: 'land-water', scenario: 'SSP5-8.5', title: 'Reservoirs (test)' },
        form: 'normal',
        baselineYear: 2020,
        anchorYears: [2100],
        mean: [0.02],
        sd: [0.01],
        ...provenance,
      })
    ).body
    const edited = await author.request('PATCH', `/api/releases/${draft.id}`, {
      form: 'normal',
      unit: 'mm',
      baselineYear: 2020,
      anchorYears: [2100],
      mean: [30],
      sd: [8],
      ...provenance,
    })
    expect(edited.status).toBe(200)
    expect((await author.get(`/api/releases/${draft.id}`)).body.distribution.mean).toEqual([0.03])

    await author.post(`/api/releases/${draft.id}/submit`)
    await reviewer.post(`/api/releases/${draft.id}/approve`)
    const late = await author.request('PATCH', `/api/releases/${draft.id}`, {
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2100],
      mean: [0.5],
      sd: [0.01],
      ...provenance,
    })
    expect(late.status).toBe(409)

    const noReason = await author.post(`/api/releases/${draft.id}/withdraw`, {})
    expect(noReason.status).toBe(400)
    expect(noReason.body.message).toMatch(/^reason: Enter the reason for withdrawal/)
    expect(
      (await author.post(`/api/releases/${draft.id}/withdraw`, { reason: 'Double-counted reservoir storage.' })).body
        .state,
    ).toBe('withdrawn')
    const read = await anonymous().get(`/api/releases/${draft.id}`)
    expect(read.body).toMatchObject({ state: 'withdrawn', withdrawalReason: 'Double-counted reservoir storage.' })
  })

  it('exports a release as CSV in the upload layout, with a sensible file name', async () => {
    const [published] = (await anonymous().get('/api/releases?component=ocean-expansion&scenario=SSP2-4.5')).body
    const csv = await anonymous().get(`/api/releases/${published.id}/csv`)
    expect(csv.status).toBe(200)
    expect(csv.headers.get('content-type')).toMatch(/text\/csv/)
    expect(csv.headers.get('content-disposition')).toBe('attachment; filename="ocean-expansion-SSP2-4.5-v1.csv"')
    expect(csv.body.split('\r\n')[0]).toBe('level,2050,2100,2150')
  })

  it('lets only one of two versions started at the same moment through, and tells the other why (409)', async () => {
    const [land] = (await author.get('/api/releases?component=land-water&scenario=SSP1-2.6&state=published')).body
    const body = {
      seriesId: land.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.01, 0.02, 0.03],
      sd: [0.005, 0.01, 0.015],
      method: 'm',
      citation: 'c',
      licence: 'l',
    }
    const answers = await Promise.all([author.post('/api/releases', body), author.post('/api/releases', body)])
    expect(answers.map(r => r.status).sort()).toEqual([201, 409])
    expect(answers.find(r => r.status === 409)!.body.message).toMatch(/(at the same moment|still a draft)/)
  })

  it('previews a release without saving it', async () => {
    const preview = await author.post('/api/releases/preview', {
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2100],
      mean: [0.5],
      sd: [0.1],
    })
    expect(preview.status).toBe(200)
    expect(preview.body.bands[0]).toMatchObject({ year: 2020, p50: 0 })
    // [practice] a normal release's median is its mean; its 17–83 % range is mean ± 0.954 sd.
    const last = preview.body.bands.at(-1)
    expect(last.year).toBe(2100)
    expect(last.p50).toBeCloseTo(0.5, 2)
    expect(last.p83 - last.p17).toBeCloseTo(2 * 0.954 * 0.1, 2)
  })
})

describe('demo science', () => {
  it('publishes a release of every component under three scenarios, a correlation set and a scale-factor grid', async () => {
    const published = (await anonymous().get('/api/releases')).body.filter(
      (r: { illustrative: boolean }) => r.illustrative,
    )
    for (const scenario of ['SSP1-2.6', 'SSP2-4.5', 'SSP5-8.5']) {
      expect(
        new Set(
          published
            .filter((r: { scenario: string }) => r.scenario === scenario)
            .map((r: { component: string }) => r.component),
        ).size,
      ).toBe(7)
    }
    const greenland = published.find(
      (r: { component: string, scenario: string }) => r.component === 'greenland' && r.scenario === 'SSP2-4.5',
    )
    expect(greenland.version).toBe(2)
    expect(
      (await anonymous().get(`/api/series/${greenland.seriesId}`)).body.versions.map((v: { state: string }) => v.state),
    ).toEqual(['published', 'superseded'])
    expect((await anonymous().get('/api/correlation-sets')).body).toHaveLength(1)
    const [grid] = (await anonymous().get('/api/scale-factor-grids')).body
    expect((await anonymous().get(`/api/scale-factor-grids/${grid.id}`)).body.warnings).toEqual([])
  })
})
