import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// A briefing that includes the site's adaptation pathways and decision records: live in a draft,
// frozen when issued (later edits to the measures leave it as it was), on the page's API and the
// shared link, refused with a reason where the site has no pathway.

const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/
let server: RunningServer
let planner: ApiClient
let siteId: string
let outlookId: string
let thresholdIds: string[]

const briefing = (overrides: Record<string, unknown> = {}) => ({
  outlookId,
  title: 'Kelwick: pathways',
  thresholdIds,
  years: [2050, 2100],
  includePathways: true,
  ...overrides,
})
const pathwaysView = async () => (await planner.get(`/api/sites/${siteId}/pathways`)).body

beforeAll(async () => {
  server = await startServer()
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick').id
  thresholdIds = (await planner.get(`/api/sites/${siteId}`)).body.thresholds.map((t: { id: string }) => t.id)
  outlookId = (await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 5_000, seed: 4 }))
    .body.id
})
afterAll(async () => { await server?.stop() })

describe('a briefing with the site\'s pathways', () => {
  it('tells the form how many pathways and records the site has', async () => {
    expect((await planner.get(`/api/sites/${siteId}`)).body.pathwayCounts).toEqual({ pathways: 1, records: 0 })
  })

  it('leaves the section out unless chosen, and refuses it where the site has no pathway', async () => {
    const plain = await planner.post('/api/briefings', briefing({ includePathways: undefined }))
    expect(plain.status).toBe(201)
    expect(plain.body.includePathways).toBe(false)
    expect((await planner.get(`/api/briefings/${plain.body.id}`)).body.document.pathways).toBeUndefined()

    const other = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name !== 'Kelwick')
    const otherOutlook = (await planner.post(`/api/sites/${other.id}/outlooks`, { scenario: 'SSP2-4.5', samples: 2_000 }))
      .body
    const otherThresholds = (await planner.get(`/api/sites/${other.id}`)).body.thresholds.map((t: { id: string }) => t.id)
    const refused = await planner.post('/api/briefings', briefing({
      outlookId: otherOutlook.id,
      thresholdIds: otherThresholds,
      years: [2050],
    }))
    expect(refused.status).toBe(400)
    expect(refused.body.data.issues).toEqual([{
      field: 'includePathways',
      message: 'This site has no adaptation pathway to include; add one on the site\'s pathways page, or leave this out.',
    }])
  })

  it('freezes the pathways and decision records when issued; a later edit of a measure leaves them as issued', async () => {
    const view = await pathwaysView()
    const demo = view.pathways[0]
    const recorded = await planner.post(`/api/sites/${siteId}/decisions`, {
      pathwayId: demo.id,
      measureId: demo.measureIds[1],
      scenario: 'SSP2-4.5',
      tolerance: 0.1,
      rationale: 'Council resolution 9/2026: raise the wall first.',
      reviewDate: '2035-03-31',
    })
    expect(recorded.status).toBe(201)

    const draft = (await planner.post('/api/briefings', briefing())).body
    expect(draft.includePathways).toBe(true)
    const live = (await planner.get(`/api/briefings/${draft.id}`)).body.document.pathways
    expect(live.asOf).toBeNull()
    expect((await planner.post(`/api/briefings/${draft.id}/issue`)).status).toBe(200)
    const issued = (await planner.get(`/api/briefings/${draft.id}`)).body.document.pathways

    expect(issued.asOf).toMatch(/^\d{4}-\d{2}-\d{2}T/)
    expect(issued.currentYear).toBe(view.currentYear)
    expect(issued.measures.map((m: { name: string }) => m.name)).toEqual(view.measures.map((m: any) => m.name))
    expect(issued.pathways).toHaveLength(1)
    const frozen = issued.pathways[0]
    expect(frozen.name).toBe(demo.name)
    expect(frozen.tolerances).toEqual([0.1, 0.5])
    // The same tipping and decision years, "already late" flags and spread as the pathways page.
    expect(frozen.decisions.map((d: any) => [d.scenario, d.tolerance, d.tippingYear, d.decisionYear, d.alreadyLate]))
      .toEqual(demo.decisions.map((d: any) => [d.scenario, d.tolerance, d.tippingYear, d.decisionYear, d.alreadyLate]))
    expect(frozen.spread.map((s: any) => [s.tolerance, s.earliest, s.latest, s.alreadyLate]))
      .toEqual(demo.spread.map((s: any) => [s.tolerance, s.earliest, s.latest, s.alreadyLate]))
    const record = issued.records[0]
    expect(record).toMatchObject({
      scenario: 'SSP2-4.5',
      tolerance: 0.1,
      rationale: 'Council resolution 9/2026: raise the wall first.',
      outlookInputHash: recorded.body.outlookInputHash,
      engineVersion: recorded.body.engineVersion,
      decidedByName: PLANNER.name,
      reviewDate: '2035-03-31',
      tippingYear: recorded.body.tippingYear,
      decisionYear: recorded.body.decisionYear,
    })
    expect(record.releases.map((r: any) => `${r.component} v${r.version}`))
      .toEqual(recorded.body.releases.map((r: any) => `${r.component} v${r.version}`))
    const names = Object.fromEntries(issued.measures.map((m: { id: string, name: string }) => [m.id, m.name]))
    expect(names[record.measureId]).toBe('Raise the quay wall by 0.4 m')
    // Named by local keys: the document names no database row.
    expect(JSON.stringify(issued)).not.toMatch(UUID)

    // The barrier (no record names it) gets higher; the raise is renamed. The page follows, the briefing does not.
    const barrier = view.measures.find((m: any) => m.id === demo.measureIds[2])
    const raise = view.measures.find((m: any) => m.id === demo.measureIds[1])
    const keep = (m: any) => ({ kind: m.kind, leadTimeYears: m.leadTimeYears, designLifeYears: m.designLifeYears,
      costBand: m.costBand })
    expect((await planner.patch(`/api/sites/${siteId}/measures/${barrier.id}`, {
      ...keep(barrier), name: barrier.name, height: 2.4,
    })).status).toBe(200)
    expect((await planner.patch(`/api/sites/${siteId}/measures/${raise.id}`, {
      ...keep(raise), name: 'Raise the quay wall (phase 1)', height: raise.height,
    })).status).toBe(200)
    const after = await pathwaysView()
    expect(after.measures.find((m: any) => m.id === raise.id).name).toBe('Raise the quay wall (phase 1)')
    expect(after.pathways[0].decisions).not.toEqual(demo.decisions)
    expect((await planner.get(`/api/briefings/${draft.id}`)).body.document.pathways).toEqual(issued)

    // The shared link shows the same frozen section; a new version keeps the choice.
    const { shareToken } = (await planner.post(`/api/briefings/${draft.id}/share`)).body
    const shared = await new ApiClient(server.url).get(`/api/shared/${shareToken}`)
    expect(shared.body.document.pathways).toEqual(issued)
    const next = await planner.post(`/api/briefings/${draft.id}/versions`)
    expect(next.status).toBe(201)
    expect(next.body.includePathways).toBe(true)
    const nextDoc = (await planner.get(`/api/briefings/${next.body.id}`)).body.document.pathways
    expect(nextDoc.measures.map((m: { name: string }) => m.name)).toContain('Raise the quay wall (phase 1)')
  })
})
