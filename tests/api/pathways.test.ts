import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { ApiClient } from '../support/client'
import { ADMIN, ANALYST, OPERATOR, PLANNER, PORT_PLANNER, READER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { TestSmtp, isTo } from '../support/smtp'

// Adaptation pathways through the API: the demo pathway, tipping years from the site's own outlook,
// decision records that keep what they rest on, refusals that say what to fix, and the decision
// alert e-mail when new science pulls a recorded decision inside its lead time.

const REVIEWER = demoUser('reviewer@saltglass.example')
const SECOND_PLANNER = { email: 'second.planner@caldwyn.example', password: 'Pathway-harbour-gauge-42' }
const SEED = 3
let server: RunningServer
let smtp: TestSmtp
let planner: ApiClient
let operator: ApiClient
let siteId: string
let outlookId: string

interface Tipping {
  tolerance: number
  year: number | null
  earliest: number | null
  latest: number | null
  resolution: string
}
interface View {
  currentYear: number
  measures: Array<{ id: string, name: string, height: number | null, leadTimeYears: number }>
  computing: string[]
  scenarios: Array<{
    scenario: string
    outlookId: string
    inputHash: string
    horizon: number
    tipping: Record<string, Tipping[]>
  }>
  pathways: Array<{
    id: string
    name: string
    illustrative: boolean
    measureIds: string[]
    tolerances: number[]
    decisions: Array<Record<string, any>>
    spread: Array<Record<string, any>>
  }>
  records: Array<Record<string, any>>
  alerts: Array<{ recordId: string, reason: { kinds: string[], tippingYear: number | null } }>
}
/** The pathways page once its tipping years are stored (they are computed in the background). */
async function view() {
  let body!: View
  await vi.waitFor(async () => {
    body = (await planner.get(`/api/sites/${siteId}/pathways`)).body as View
    if (body.computing.length) throw new Error(`still computing ${body.computing.join(', ')}`)
  }, { timeout: 60_000, interval: 100 })
  return body
}
const tippingOf = (v: View, measureId: string, tolerance: number) =>
  v.scenarios.find(s => s.scenario === 'SSP2-4.5')!.tipping[measureId]!.find(t => t.tolerance === tolerance)!

async function publishGlaciers(mean: [number, number, number], citation: string) {
  const analyst = await ApiClient.signedIn(server.url, ANALYST.email, ANALYST.password)
  const reviewer = await ApiClient.signedIn(server.url, REVIEWER.email, REVIEWER.password)
  const [current] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP2-4.5&state=published')).body
  const draft = await analyst.post('/api/releases', {
    seriesId: current.seriesId,
    form: 'normal',
    baselineYear: 2020,
    anchorYears: [2050, 2100, 2150],
    mean,
    sd: [0.01, 0.03, 0.04],
    method: 'm',
    citation,
    licence: 'l',
  })
  expect(draft.status).toBe(201)
  await analyst.post(`/api/releases/${draft.body.id}/submit`)
  expect((await reviewer.post(`/api/releases/${draft.body.id}/approve`)).status).toBe(200)
}

/** Waits until the recomputation that followed a publication has finished and its mail has left. */
async function recomputed(before: number) {
  await vi.waitFor(async () => {
    const list = (await operator.get('/api/admin/recomputations')).body.recomputations as Array<{
      finishedAt: string | null
    }>
    if (list.length <= before || !list[0]!.finishedAt) throw new Error('still recomputing')
  }, { timeout: 60_000, interval: 100 })
  await expect
    .poll(
      async () =>
        (await operator.get('/api/admin/outbox')).body.messages.filter((m: { state: string }) => m.state === 'queued')
          .length,
      { timeout: 20_000 },
    )
    .toBe(0)
}
const recomputationCount = async () =>
  ((await operator.get('/api/admin/recomputations')).body.recomputations as unknown[]).length
const alertMails = () => smtp.messages.filter(m => /recorded decision|decisión registrada/.test(m.subject ?? ''))

beforeAll(async () => {
  smtp = await new TestSmtp().start()
  server = await startServer({
    SMTP_URL: smtp.url,
    MAIL_POLL_MS: '200',
    MAIL_RETRY_BASE_MS: '200',
    JOBS_POLL_MS: '100',
  })
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  operator = await ApiClient.signedIn(server.url, OPERATOR.email, OPERATOR.password)
  const admin = await ApiClient.signedIn(server.url, ADMIN.email, ADMIN.password)
  const council = ((await operator.get('/api/organisations')).body as Array<{ id: string, kind: string }>).find(
    o => o.kind === 'council',
  )!.id
  expect(
    (
      await admin.post('/api/admin/users', {
        email: SECOND_PLANNER.email,
        name: 'Second Planner',
        role: 'planner',
        organisationId: council,
        password: SECOND_PLANNER.password,
      })
    ).status,
  ).toBe(201)
  siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick').id
  outlookId = (
    await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: SEED })
  ).body.id
})
afterAll(async () => {
  await server?.stop()
  await smtp?.stop()
})

describe('adaptation pathways', () => {
  it('shows the demo pathway, labelled illustrative, with tipping years from the site\'s outlook', async () => {
    const v = await view()
    const [demo] = v.pathways
    expect(demo!.illustrative).toBe(true)
    expect(demo!.measureIds).toHaveLength(4)
    // The demo's measures are listed in the order they were written, from today's wall to retreat.
    expect(v.measures.map(m => m.name)).toEqual([
      'Today\'s quay wall',
      'Raise the quay wall by 0.4 m',
      'Tidal barrier at the harbour mouth',
      'Managed retreat from the quay district',
    ])
    expect(v.scenarios.map(s => s.scenario)).toEqual(['SSP2-4.5'])
    expect(v.scenarios[0]!.outlookId).toBe(outlookId)
    // Each step's decision year is the tipping year of the measure in service less the next one's lead time.
    for (const d of demo!.decisions) {
      const lead = v.measures.find(m => m.id === d.toMeasureId)!.leadTimeYears
      expect(d.leadTimeYears).toBe(lead)
      if (d.tippingYear !== null) {
        expect(d.decisionYear).toBe(d.tippingYear - lead) // [practice] decision = tipping − lead time
        expect(d.alreadyLate).toBe(d.decisionYear < v.currentYear)
        expect(d.tippingEarliest).toBeLessThanOrEqual(d.tippingYear)
      }
    }
    // Reader sees it too, without the forms.
    const reader = await ApiClient.signedIn(server.url, READER.email, READER.password)
    const read = await reader.get(`/api/sites/${siteId}/pathways`)
    expect(read.status).toBe(200)
    expect(read.body.canEdit).toBe(false)
  })

  it('tips a measure at a site threshold\'s height in the outlook\'s own trigger years', async () => {
    // Same trajectories (seed and samples) as the outlook, so the engine's annual trigger years agree.
    const outlook = (await planner.get(`/api/outlooks/${outlookId}`)).body
    const quay = outlook.result.thresholds[0]
    const made = await planner.post(`/api/sites/${siteId}/measures`, {
      name: 'Quay Street edge',
      height: 0.5,
      leadTimeYears: 0,
    })
    expect(made.status).toBe(201)
    const v = await view()
    for (const tolerance of [0.1, 0.5]) {
      expect(tippingOf(v, made.body.id, tolerance).year).toBe(
        quay.triggerYears.find((t: { tolerance: number }) => t.tolerance === tolerance).year,
      )
    }
  })

  it.each([
    [
      'a negative lead time',
      'measures',
      { name: 'Gate', height: 2, leadTimeYears: -1 },
      /^leadTimeYears: A lead time cannot be negative/,
    ],
    [
      'a measure below today\'s level',
      'measures',
      { name: 'Low wall', height: -0.1, leadTimeYears: 3 },
      /^height: -0\.10 m is at or below mean sea level at the reference epoch/,
    ],
    [
      'a flood level below the usual yearly high water',
      'measures',
      { name: 'Low crest', height: 0.5, kind: 'flood-level', leadTimeYears: 3 },
      /^height: 0\.50 m is at or below the usual yearly highest water/,
    ],
  ])('refuses %s with a 400 that says what to fix, and stores nothing', async (_name, path, body, message) => {
    const before = await view()
    const response = await planner.post(`/api/sites/${siteId}/${path}`, body)
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(message)
    expect((await view()).measures).toHaveLength(before.measures.length)
  })

  it('refuses a cyclic pathway, naming the repeated step', async () => {
    const ids = (await view()).measures.map(m => m.id)
    const response = await planner.post(`/api/sites/${siteId}/pathways`, {
      name: 'Back and forth',
      measureIds: [ids[0], ids[1], ids[0]],
    })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(
      /^measureIds\.2: This measure is already step 1; a pathway cannot return to an earlier measure \(a cycle\)/,
    )
    expect(response.body.data.issues[0].field).toBe('measureIds.2')
  })

  it('records a decision with the outlook it rests on, immutable, listed per site', async () => {
    const v = await view()
    const demo = v.pathways[0]!
    const response = await planner.post(`/api/sites/${siteId}/decisions`, {
      pathwayId: demo.id,
      measureId: demo.measureIds[1],
      scenario: 'SSP2-4.5',
      tolerance: 0.1,
      rationale: 'Council resolution 14/2026 (illustrative).',
      reviewDate: '2031-06-30',
    })
    expect(response.status).toBe(201)
    const record = response.body
    const outlook = (await planner.get(`/api/outlooks/${outlookId}`)).body
    expect(record.outlookInputHash).toBe(outlook.inputHash)
    expect(record.releases.map((r: { component: string, version: number }) => `${r.component} v${r.version}`)).toEqual(
      outlook.releaseRefs.map((r: { component: string, version: number }) => `${r.component} v${r.version}`),
    )
    const step = demo.decisions.find(d => d.toMeasureId === demo.measureIds[1] && d.tolerance === 0.1)!
    expect(record.tippingYear).toBe(step.tippingYear)
    expect(record.decisionYear).toBe(step.decisionYear)
    expect(record.decidedByName).toBe(PLANNER.name)
    expect((await view()).records.map(r => r.id)).toContain(record.id)
    // No route changes a record.
    expect([404, 405]).toContain(
      (await planner.patch(`/api/sites/${siteId}/decisions`, { rationale: 'changed' })).status,
    )
  })

  it('refuses a decision on the measure already in service', async () => {
    const demo = (await view()).pathways[0]!
    const response = await planner.post(`/api/sites/${siteId}/decisions`, {
      pathwayId: demo.id,
      measureId: demo.measureIds[0],
      scenario: 'SSP2-4.5',
      tolerance: 0.1,
      rationale: 'x',
      reviewDate: '2031-01-01',
    })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/^measureId: The first measure of a pathway is the one in service/)
  })
})

describe('decision alerts', () => {
  let recordId: string

  it('sends none when new science leaves a recorded decision outside its lead time', async () => {
    // A pathway whose next measure's lead time leaves six years before its decision year.
    const v = await view()
    const edge = v.measures.find(m => m.name === 'Quay Street edge')!
    const tipping = tippingOf(v, edge.id, 0.5).year!
    const lead = tipping - v.currentYear - 6
    expect(lead).toBeGreaterThan(0)
    const barrier = (
      await planner.post(`/api/sites/${siteId}/measures`, {
        name: 'Quay Street barrier',
        height: 1.5,
        leadTimeYears: lead,
      })
    ).body
    const pathway = (
      await planner.post(`/api/sites/${siteId}/pathways`, {
        name: 'Quay Street',
        measureIds: [edge.id, barrier.id],
        tolerances: [0.5],
      })
    ).body
    const record = (
      await planner.post(`/api/sites/${siteId}/decisions`, {
        pathwayId: pathway.id,
        measureId: barrier.id,
        scenario: 'SSP2-4.5',
        tolerance: 0.5,
        rationale: 'Build the barrier.',
        reviewDate: '2030-01-01',
        marginYears: 50,
      })
    ).body
    expect(record.decisionYear).toBe(v.currentYear + 6) // [practice] tipping − (tipping − now − 6)
    recordId = record.id

    const count = await recomputationCount()
    await publishGlaciers([0.06, 0.16, 0.22], 'Glaciers, small revision')
    await recomputed(count)
    expect(alertMails()).toHaveLength(0)
    expect((await view()).alerts).toHaveLength(0)
    expect((await planner.get(`/api/sites/${siteId}`)).body.decisionAlerts).toBe(0)
  })

  it('sends exactly one e-mail per planner when new science pulls the decision inside its lead time, and flags the site until a review', async () => {
    const count = await recomputationCount()
    await publishGlaciers([0.6, 1.6, 2.2], 'Glaciers, large revision')
    await recomputed(count)
    const mails = alertMails()
    expect(mails.filter(isTo(PLANNER.email))).toHaveLength(1)
    expect(mails.filter(isTo(SECOND_PLANNER.email))).toHaveLength(1)
    expect(mails).toHaveLength(2)
    expect(mails[0]!.subject).toBe('A recomputed outlook moves a recorded decision at Kelwick')
    // The mail opens with what made the outlook be computed again: here a glaciers release.
    expect(mails[0]!.text).toMatch(
      /A new release for .*glaciers.*The outlook behind decisions recorded for Kelwick was computed again and moves them/is,
    )
    expect(mails[0]!.text).toMatch(/Quay Street barrier \(← Quay Street edge\)/)
    expect(mails[0]!.text).toMatch(/already late/)
    expect(mails[0]!.text).toMatch(/Glaciers, large revision/)

    const v = await view()
    expect(v.alerts.map(a => a.recordId)).toContain(recordId)
    expect(v.alerts.find(a => a.recordId === recordId)!.reason.kinds).toEqual(['late'])
    expect((await planner.get(`/api/sites/${siteId}`)).body.decisionAlerts).toBeGreaterThan(0)
    // The overview lists it first for everyone in the organisation.
    const waiting = async () =>
      (await planner.get('/api/attention')).body as Array<{ kind: string, siteName?: string, alerts?: number }>
    expect((await waiting())[0]).toMatchObject({ kind: 'decision-alert', siteName: 'Kelwick' })

    // A review is a new record naming the old one; the flag clears.
    const old = v.records.find(r => r.id === recordId)!
    const review = await planner.post(`/api/sites/${siteId}/decisions`, {
      pathwayId: old.pathwayId,
      measureId: old.measureId,
      scenario: 'SSP2-4.5',
      tolerance: 0.5,
      rationale: 'Reviewed after the new glacier release.',
      reviewDate: '2028-01-01',
      reviewsRecordId: recordId,
    })
    expect(review.status).toBe(201)
    expect((await view()).alerts.filter(a => a.recordId === recordId)).toHaveLength(0)
    // It counts the alerts still open at the site (another decision's may remain).
    const open = (await view()).alerts.length
    expect((await waiting()).filter(item => item.kind === 'decision-alert')).toEqual(
      open ? [expect.objectContaining({ siteName: 'Kelwick', alerts: open })] : [],
    )
  })
})

describe('stored tipping years', () => {
  it('are read from what was stored for the outlook, and stored anew when a measure is added', async () => {
    const before = await view()
    const scenario = before.scenarios.find(s => s.scenario === 'SSP2-4.5')!
    const site = (await planner.get(`/api/sites/${siteId}`)).body as { gumbelLocation: number }
    const gate = await planner.post(`/api/sites/${siteId}/measures`, {
      name: 'Harbour flood gate',
      height: site.gumbelLocation + 0.9,
      kind: 'flood-level',
      leadTimeYears: 8,
    })
    expect(gate.status).toBe(201)
    // A read never computes: until the new measure's tipping years are stored, it says they are coming.
    const first = (await planner.get(`/api/sites/${siteId}/pathways`)).body as View
    if (!first.computing.includes('SSP2-4.5'))
      expect(first.scenarios.find(s => s.scenario === 'SSP2-4.5')!.tipping[gate.body.id]).toBeDefined()
    const after = await view()
    const now = after.scenarios.find(s => s.scenario === 'SSP2-4.5')!
    expect(now.outlookId).toBe(scenario.outlookId)
    // The same trajectories: the measures there before tip in the same years.
    for (const measure of before.measures) expect(now.tipping[measure.id]).toEqual(scenario.tipping[measure.id])
    // The flood level is followed year by year: its tipping years do not fall back as the tolerance rises.
    const flood = now.tipping[gate.body.id]!
    expect(flood.every(t => t.resolution === 'annual')).toBe(true)
    const years = flood.map(t => t.year ?? now.horizon + 1)
    expect(years).toEqual([...years].sort((a, b) => a - b))
  })

  it('answers 404 for another organisation\'s site, like a missing one', async () => {
    const port = await ApiClient.signedIn(server.url, PORT_PLANNER.email, PORT_PLANNER.password)
    const response = await port.get(`/api/sites/${siteId}/pathways`)
    expect(response.status).toBe(404)
    expect(JSON.stringify(response.body)).not.toContain('Quay Street')
  })
})
