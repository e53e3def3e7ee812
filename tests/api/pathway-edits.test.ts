import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ADMIN, PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// Editing and deleting a site's measures and pathways: the sequence is checked again, a measure a
// pathway lists or a record names is not deleted, and what a decision record rests on keeps the
// values it was decided on. Only the site's own planners may; others get 403 or 404.

let server: RunningServer
let planner: ApiClient
let reader: ApiClient
let portPlanner: ApiClient
let admin: ApiClient
let siteId: string

interface Measure { id: string, name: string, height: number | null, kind: string, leadTimeYears: number }
interface View {
  measures: Measure[]
  pathways: Array<{ id: string, name: string, measureIds: string[], tolerances: number[] }>
  records: Array<{ id: string, measureId: string, fromMeasureId: string }>
}
const view = async () => (await planner.get(`/api/sites/${siteId}/pathways`)).body as View
const measureBody = (overrides: Record<string, unknown> = {}) => ({
  name: 'Floodable park',
  height: 0.9,
  kind: 'mean-sea-level',
  leadTimeYears: 6,
  designLifeYears: 40,
  costBand: 'low',
  ...overrides,
})
const newMeasure = async (name: string) => {
  const response = await planner.post(`/api/sites/${siteId}/measures`, measureBody({ name }))
  expect(response.status).toBe(201)
  return response.body as Measure
}
const newPathway = async (name: string, measureIds: string[]) => {
  const response = await planner.post(`/api/sites/${siteId}/pathways`, { name, measureIds, tolerances: [0.1, 0.5] })
  expect(response.status).toBe(201)
  return response.body as { id: string }
}
const auditActions = async () =>
  ((await admin.get('/api/admin/audit?limit=50')).body as Array<{ action: string, detail: any }>)

beforeAll(async () => {
  server = await startServer()
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  reader = await ApiClient.signedIn(server.url, READER.email, READER.password)
  portPlanner = await ApiClient.signedIn(server.url, PORT_PLANNER.email, PORT_PLANNER.password)
  admin = await ApiClient.signedIn(server.url, ADMIN.email, ADMIN.password)
  siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick').id
  expect(
    (await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 5_000, seed: 5 })).status,
  ).toBeLessThan(300)
})
afterAll(async () => { await server?.stop() })

describe('editing measures', () => {
  it('changes a measure, checks it as on creation and writes an audit line', async () => {
    const measure = await newMeasure('Park to edit')
    const edited = await planner.patch(
      `/api/sites/${siteId}/measures/${measure.id}`,
      measureBody({ name: 'Floodable park, raised', height: 1.1, leadTimeYears: 8 }),
    )
    expect(edited.status).toBe(200)
    expect(edited.body).toMatchObject({ id: measure.id, name: 'Floodable park, raised', height: 1.1, leadTimeYears: 8 })
    expect((await view()).measures.find(m => m.id === measure.id)).toMatchObject({ height: 1.1 })
    const line = (await auditActions()).find(a => a.action === 'measure.updated')!
    expect(line.detail).toMatchObject({ measure: measure.id, before: { height: 0.9 }, after: { height: 1.1 } })

    const negative = await planner.patch(
      `/api/sites/${siteId}/measures/${measure.id}`,
      measureBody({ leadTimeYears: -2 }),
    )
    expect(negative.status).toBe(400)
    expect(negative.body.message).toMatch(/^leadTimeYears: A lead time cannot be negative/)
    const below = await planner.patch(`/api/sites/${siteId}/measures/${measure.id}`, measureBody({ height: -1 }))
    expect(below.status).toBe(400)
    expect(below.body.message).toMatch(/^height: .* at or below mean sea level at the reference epoch/)
  })

  it('answers 404 for a measure of another site and for another organisation\'s planner, 403 for a reader', async () => {
    const measure = await newMeasure('Park for access checks')
    const url = `/api/sites/${siteId}/measures/${measure.id}`
    const other = (await planner.get('/api/sites')).body.find((s: { id: string }) => s.id !== siteId).id
    expect((await planner.patch(`/api/sites/${other}/measures/${measure.id}`, measureBody())).status).toBe(404)
    expect((await planner.request('DELETE', `/api/sites/${other}/measures/${measure.id}`)).status).toBe(404)
    expect((await portPlanner.patch(url, measureBody())).status).toBe(404)
    expect((await portPlanner.request('DELETE', url)).status).toBe(404)
    expect((await reader.patch(url, measureBody())).status).toBe(403)
    expect((await reader.request('DELETE', url)).status).toBe(403)
    expect((await new ApiClient(server.url).request('DELETE', url)).status).toBe(401)
    expect((await view()).measures.find(m => m.id === measure.id)).toMatchObject({ name: 'Park for access checks' })
    // A site holds at most 12 measures: this one has served.
    expect((await planner.request('DELETE', url)).status).toBe(200)
  })
})

describe('deleting measures', () => {
  it('deletes a measure no pathway lists, with an audit line', async () => {
    const measure = await newMeasure('Park to delete')
    const response = await planner.request('DELETE', `/api/sites/${siteId}/measures/${measure.id}`)
    expect(response.status).toBe(200)
    expect((await view()).measures.map(m => m.id)).not.toContain(measure.id)
    expect((await auditActions()).find(a => a.action === 'measure.deleted')!.detail).toMatchObject({
      measure: measure.id,
      name: 'Park to delete',
    })
  })

  it('refuses a measure a pathway lists, naming the pathway', async () => {
    const first = await newMeasure('Dune nourishment')
    const second = await newMeasure('Set-back line')
    await newPathway('Soft defences', [first.id, second.id])
    const response = await planner.request('DELETE', `/api/sites/${siteId}/measures/${second.id}`)
    expect(response.status).toBe(409)
    expect(response.body.message).toBe(
      '"Set-back line" is step 2 of the pathway "Soft defences"; remove it from that pathway (or delete the pathway) first.',
    )
    expect((await view()).measures.map(m => m.id)).toContain(second.id)
  })
})

describe('editing and deleting pathways', () => {
  it('re-checks the sequence: no cycles, measures of this site only', async () => {
    const a = await newMeasure('Step A')
    const b = await newMeasure('Step B')
    const pathway = await newPathway('A then B', [a.id, b.id])
    const url = `/api/sites/${siteId}/pathways/${pathway.id}`
    const cyclic = await planner.patch(url, { name: 'A, B, A', measureIds: [a.id, b.id, a.id] })
    expect(cyclic.status).toBe(400)
    expect(cyclic.body.data.issues[0]).toMatchObject({ field: 'measureIds.2' })
    expect(cyclic.body.data.issues[0].message).toMatch(/already step 1; a pathway cannot return to an earlier measure/)
    const foreign = await planner.patch(url, { name: 'Stray', measureIds: [a.id, crypto.randomUUID()] })
    expect(foreign.status).toBe(400)
    expect(foreign.body.message).toMatch(/^measureIds\.1: This is not a measure of this site/)

    const c = await newMeasure('Step C')
    const edited = await planner.patch(url, { name: 'A, C then B', measureIds: [a.id, c.id, b.id], tolerances: [0.2] })
    expect(edited.status).toBe(200)
    expect((await view()).pathways.find(p => p.id === pathway.id)).toMatchObject({
      name: 'A, C then B',
      measureIds: [a.id, c.id, b.id],
      tolerances: [0.2],
    })
    expect((await reader.patch(url, { name: 'x', measureIds: [a.id, b.id] })).status).toBe(403)
    expect((await portPlanner.patch(url, { name: 'x', measureIds: [a.id, b.id] })).status).toBe(404)

    expect((await reader.request('DELETE', url)).status).toBe(403)
    expect((await portPlanner.request('DELETE', url)).status).toBe(404)
    expect((await planner.request('DELETE', url)).status).toBe(200)
    expect((await view()).pathways.map(p => p.id)).not.toContain(pathway.id)
    expect((await auditActions()).find(a => a.action === 'pathway.deleted')!.detail).toMatchObject({
      pathway: pathway.id,
      name: 'A, C then B',
    })
    // Out of the pathway, the measures can go.
    for (const measure of [a, b, c])
      expect((await planner.request('DELETE', `/api/sites/${siteId}/measures/${measure.id}`)).status).toBe(200)
  })
})

describe('what decision records rest on', () => {
  let pathwayId: string
  let from: Measure
  let to: Measure

  beforeAll(async () => {
    from = await newMeasure('Recorded wall')
    to = await newMeasure('Recorded raise')
    pathwayId = (await newPathway('Recorded pathway', [from.id, to.id])).id
    const recorded = await planner.post(`/api/sites/${siteId}/decisions`, {
      pathwayId,
      measureId: to.id,
      scenario: 'SSP2-4.5',
      tolerance: 0.1,
      rationale: 'Council resolution 7/2026 (test).',
      reviewDate: '2040-01-01',
    })
    expect(recorded.status).toBe(201)
  })

  it('keeps the height, kind and lead time of a recorded measure, but lets its name change', async () => {
    const url = `/api/sites/${siteId}/measures/${to.id}`
    const raised = await planner.patch(url, measureBody({ name: 'Recorded raise', height: 1.5 }))
    expect(raised.status).toBe(409)
    expect(raised.body.message).toMatch(
      /^"Recorded raise" is named by a decision record \(the first under SSP2-4\.5, recorded \d{4}-\d{2}-\d{2} by .+\), which keep the height, kind and lead time they were decided on\. Add a new measure with the new values/,
    )
    expect((await view()).measures.find(m => m.id === to.id)).toMatchObject({ height: 0.9, leadTimeYears: 6 })
    const renamed = await planner.patch(url, measureBody({ name: 'Recorded raise (phase 1)', costBand: 'medium' }))
    expect(renamed.status).toBe(200)
  })

  it('refuses to delete a recorded measure or pathway, saying why and what to do', async () => {
    const measure = await planner.request('DELETE', `/api/sites/${siteId}/measures/${from.id}`)
    expect(measure.status).toBe(409)
    expect(measure.body.message).toMatch(/decision records are never changed or deleted, so the measure they rest on stays/)
    const pathway = await planner.request('DELETE', `/api/sites/${siteId}/pathways/${pathwayId}`)
    expect(pathway.status).toBe(409)
    expect(pathway.body.message).toMatch(/^The pathway "Recorded pathway" is named by a decision record .*Rename it/)
    const v = await view()
    expect(v.pathways.map(p => p.id)).toContain(pathwayId)
    expect(v.records.some(r => r.measureId === to.id && r.fromMeasureId === from.id)).toBe(true)
  })

  it('keeps a recorded pathway\'s recorded measures and tolerance, and allows the rest', async () => {
    const url = `/api/sites/${siteId}/pathways/${pathwayId}`
    const other = await newMeasure('Later barrier')
    const dropped = await planner.patch(url, { name: 'Recorded pathway', measureIds: [other.id, to.id] })
    expect(dropped.status).toBe(409)
    expect(dropped.body.message).toMatch(/^"Recorded wall" is part of a decision recorded on this pathway/)
    const tolerance = await planner.patch(url, {
      name: 'Recorded pathway',
      measureIds: [from.id, to.id],
      tolerances: [0.5],
    })
    expect(tolerance.status).toBe(409)
    expect(tolerance.body.message).toMatch(/recorded at a tolerance of 10 %/)
    const extended = await planner.patch(url, {
      name: 'Recorded pathway, extended',
      measureIds: [from.id, to.id, other.id],
      tolerances: [0.1, 0.5],
    })
    expect(extended.status).toBe(200)
  })
})
