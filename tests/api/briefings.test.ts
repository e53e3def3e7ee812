import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

let server: RunningServer
let planner: ApiClient
let reader: ApiClient
let portPlanner: ApiClient
let siteId: string
let thresholdIds: string[]
let outlookId: string
let comparisonId: string

const as = (email: string, password: string) => ApiClient.signedIn(server.url, email, password)

const briefing = (overrides: Record<string, unknown> = {}) => ({
  outlookId,
  comparisonOutlookIds: [comparisonId],
  title: 'Kelwick: sea level to 2100',
  audience: 'Harbour committee',
  localContext: '<script>alert("x")</script> Quay Street floods at spring tides.',
  language: 'en',
  units: 'm',
  thresholdIds,
  years: [2050, 2100],
  ...overrides,
})

beforeAll(async () => {
  server = await startServer()
  planner = await as(PLANNER.email, PLANNER.password)
  reader = await as(READER.email, READER.password)
  portPlanner = await as(PORT_PLANNER.email, PORT_PLANNER.password)
  siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick').id
  thresholdIds = (await planner.get(`/api/sites/${siteId}`)).body.thresholds.map((t: { id: string }) => t.id)
  outlookId = (await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000 })).body.id
  comparisonId = (await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP5-8.5', samples: 20_000 })).body
    .id
})
afterAll(async () => { await server?.stop() })

describe('briefings', () => {
  let draftId: string

  it('drafts a briefing whose document carries the summary, table, basis, cautions and provenance', async () => {
    const created = await planner.post('/api/briefings', briefing())
    expect(created.status).toBe(201)
    draftId = created.body.id
    const { body } = await planner.get(`/api/briefings/${draftId}`)
    expect(body).toMatchObject({ state: 'draft', version: 1, canEdit: true, shared: false })
    const doc = body.document
    expect(doc.meta).toMatchObject({ siteName: 'Kelwick', scenario: 'SSP2-4.5', illustrative: true, issuedAt: null })
    expect(doc.meta).toMatchObject({ organisation: 'Caldwyn Coast Regional Council', author: 'Noor Halloran' })
    expect(doc.meta.heights).toMatch(/^Heights in metres above .+\.$/)
    // The findings: the key (mean-sea-level) threshold by 2100, its trigger year, the spread over the two scenarios.
    expect(doc.summary.findings).toHaveLength(3)
    expect(doc.summary.findings[0]).toMatch(
      /^Under SSP2-4\.5, the chance that the mean sea level at Kelwick rises above “High-tide flooding of Quay Street” \(0\.50 m\) is .+ \(.+\) by 2050 and .+ \(.+\) by 2100\.$/,
    )
    expect(doc.summary.findings[2]).toMatch(/^Across the 2 scenarios compared, that chance by 2100 /)
    expect(doc.summary.grid.rows.map((r: { threshold: string }) => r.threshold)).toEqual([
      'High-tide flooding of Quay Street',
      'Sea wall crest',
    ])
    // For the engineer (a chance beyond the releases' outermost level is marked extrapolated, with no
    // calibrated word): one line for the mean-sea-level threshold; two years, the life and the design-life level of the
    // flood level.
    expect(doc.detail.lines).toHaveLength(5)
    expect(doc.detail.lines[0]).toMatch(
      /^“High-tide flooding of Quay Street” \(0\.50 m\): the chance that the mean sea level here is above it is (\d+|less than 1|more than 99)\u00A0% \((?:[a-z ]+|extrapolated: the releases do not describe this tail)\) by 2050 and .+ by 2100\.$/,
    )
    const wall = doc.detail.lines.filter((line: string) => /^Sea wall crest \(flood level/.test(line))
    expect(wall).toHaveLength(4)
    expect(wall[0]).toMatch(
      /^Sea wall crest \(flood level, 2\.30 m\): In 2050 the water is expected to reach 2\.30 m above .+: an? .+ chance in any one year\.$/,
    )
    expect(wall[2]).toMatch(
      /^Sea wall crest \(flood level, 2\.30 m\): Built in 2031 for 50 years \(2031–2080\): a .+ chance \(.+\) that the water reaches the level at least once in that time\.$/,
    )
    expect(wall[3]).toMatch(/: its design-life level\.$/)
    expect(wall.join(' ')).not.toMatch(/exceptionally unlikely/)
    expect(doc.table.rows.map((r: { measure: string }) => r.measure)).toContain(
      'Flood level: the water reaches it in that year',
    )
    expect(doc.table.rows.map((r: { scenario: string }) => r.scenario)).toEqual([
      'SSP2-4.5',
      'SSP2-4.5',
      'SSP5-8.5',
      'SSP5-8.5',
    ])
    expect(doc.extremes.rows).toHaveLength(2)
    // Amplification is worded as expected floods of today's 100-year level, with the chance beside it, never a bare
    // multiple.
    expect(doc.extremes.rows[0].expected).toMatch(
      /^(about once every [\d.,]+ years \([\d.,]+ times as many expected floods as today\)|every year or more often)/,
    )
    expect(doc.extremes.rows[0].chance).toMatch(/%$/)
    expect(doc.basis.releases.length).toBe(14)
    expect(doc.cautions.join(' ')).toMatch(
      /Projections are not predictions.*ice sheets.*not engineering or legal advice/,
    )
    expect(doc.meta.localContext).toBe('<script>alert("x")</script> Quay Street floods at spring tides.')
  })

  it('keeps drafts inside the organisation and away from readers', async () => {
    expect((await portPlanner.get(`/api/briefings/${draftId}`)).status).toBe(404)
    expect((await portPlanner.get(`/api/briefings/${draftId}/pdf`)).status).toBe(404)
    expect((await reader.get(`/api/briefings/${draftId}`)).status).toBe(404)
    expect((await reader.post('/api/briefings', briefing())).status).toBe(403)
    expect((await portPlanner.post('/api/briefings', briefing())).status).toBe(404)
  })

  it('refuses a year not in the outlook and a threshold of another site', async () => {
    const year = await planner.post('/api/briefings', briefing({ years: [2055] }))
    expect(year.status).toBe(400)
    expect(year.body.message).toMatch(/^years: 2055 is not a year of the outlook; choose from/)
    const other = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Drumhaven').id
    const foreign = (await planner.get(`/api/sites/${other}`)).body.thresholds[0].id
    const threshold = await planner.post('/api/briefings', briefing({ thresholdIds: [foreign] }))
    expect(threshold.status).toBe(400)
    expect(threshold.body.message).toMatch(/is not a threshold of this site/)
  })

  it.each([
    ['a year twice', { years: [2050, 2050] }, /^years: Choose each year once\./],
    [
      'a threshold twice',
      () => ({ thresholdIds: [thresholdIds[0], thresholdIds[0]] }),
      /^thresholdIds: Choose each threshold once\./,
    ],
    [
      'a compared outlook twice',
      () => ({ comparisonOutlookIds: [comparisonId, comparisonId] }),
      /^comparisonOutlookIds: Compare each outlook once\./,
    ],
  ])('refuses %s, saying so, and drafts nothing', async (_name, overrides, message) => {
    const before = (await planner.get('/api/briefings')).body.length
    const response = await planner.post(
      '/api/briefings',
      briefing(typeof overrides === 'function' ? overrides() : overrides),
    )
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(message)
    expect((await planner.get('/api/briefings')).body.length).toBe(before)
  })

  it('issues once, then never changes: edits answer 409 and a new version links back', async () => {
    expect((await planner.patch(`/api/briefings/${draftId}`, briefing({ title: 'Kelwick to 2100 (v1)' }))).status).toBe(
      200,
    )
    const issued = await planner.post(`/api/briefings/${draftId}/issue`)
    expect(issued.body).toMatchObject({ state: 'issued', title: 'Kelwick to 2100 (v1)' })
    const frozen = (await planner.get(`/api/briefings/${draftId}`)).body.document
    expect(frozen.meta.issuedAt).toBe(issued.body.issuedAt)

    const edit = await planner.patch(`/api/briefings/${draftId}`, briefing({ title: 'Changed' }))
    expect(edit.status).toBe(409)
    expect(edit.body.message).toMatch(/never changes; start a new version/)
    expect((await planner.post(`/api/briefings/${draftId}/issue`)).status).toBe(409)
    expect((await planner.get(`/api/briefings/${draftId}`)).body.document).toEqual(frozen)

    const next = await planner.post(`/api/briefings/${draftId}/versions`)
    expect(next.status).toBe(201)
    expect(next.body).toMatchObject({ version: 2, previousId: draftId, state: 'draft' })
    await planner.post(`/api/briefings/${next.body.id}/issue`)
    expect((await planner.get(`/api/briefings/${next.body.id}`)).body.document.meta.previousVersion).toBe(1)

    const read = await reader.get(`/api/briefings/${draftId}`)
    expect(read.status).toBe(200)
    expect(read.body).toMatchObject({ canEdit: false, shareToken: null })
    expect((await reader.patch(`/api/briefings/${draftId}`, briefing())).status).toBe(403)
  })

  it('shares an issued briefing by an unguessable link that stops working the moment it is revoked', async () => {
    const draft = (await planner.post('/api/briefings', briefing({ comparisonOutlookIds: [] }))).body
    const early = await planner.post(`/api/briefings/${draft.id}/share`)
    expect(early.status).toBe(409)
    await planner.post(`/api/briefings/${draft.id}/issue`)
    const { shareToken } = (await planner.post(`/api/briefings/${draft.id}/share`)).body
    expect(shareToken).toMatch(/^[\w-]{32}$/)

    const anonymous = new ApiClient(server.url)
    const shared = await anonymous.get(`/api/shared/${shareToken}`)
    expect(shared.status).toBe(200)
    expect(shared.body.document.meta.siteName).toBe('Kelwick')
    const pdf = await fetch(`${server.url}/api/shared/${shareToken}/pdf?paper=letter`)
    expect(pdf.status).toBe(200)
    expect(pdf.headers.get('content-type')).toBe('application/pdf')

    await planner.request('DELETE', `/api/briefings/${draft.id}/share`)
    expect((await anonymous.get(`/api/shared/${shareToken}`)).status).toBe(404)
    expect((await fetch(`${server.url}/api/shared/${shareToken}/pdf`)).status).toBe(404)
    expect((await anonymous.get('/api/shared/not-a-token')).status).toBe(404)
  })

  it('streams a PDF with a sensible name and the app font embedded', async () => {
    const response = await planner.fetchRaw(`/api/briefings/${draftId}/pdf`)
    expect(response.status).toBe(200)
    expect(response.headers.get('content-disposition')).toMatch(
      /^attachment; filename="brinkwater-kelwick-ssp2-4.5-v1-\d{4}-\d{2}-\d{2}\.pdf"$/,
    )
    const bytes = Buffer.from(await response.arrayBuffer())
    expect(bytes.subarray(0, 5).toString()).toBe('%PDF-')
    expect(bytes.includes(Buffer.from('AtkinsonHyperlegible'))).toBe(true)
    expect((await planner.get(`/api/briefings/${draftId}/pdf?paper=a3`)).status).toBe(400)
  })

  it('lists briefings: planners see drafts, readers only issued ones', async () => {
    await planner.post('/api/briefings', briefing({ title: 'Still a draft' }))
    const mine = (await planner.get(`/api/briefings?siteId=${siteId}`)).body
    const theirs = (await reader.get(`/api/briefings?siteId=${siteId}`)).body
    expect(mine.some((b: { state: string }) => b.state === 'draft')).toBe(true)
    expect(theirs.every((b: { state: string }) => b.state === 'issued')).toBe(true)
    expect(theirs[0]).not.toHaveProperty('shareToken')
  })
})
