import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// High-end storylines are a layer of their own: reviewed like releases, shown beside an outlook's
// chances at the site, and never sampled, so publishing one changes no outlook and queues no work.

const REVIEWER = demoUser('reviewer@saltglass.example')
const PROVENANCE = { method: 'Storyline test method.', citation: 'Storyline test (2026).', licence: 'CC BY 4.0' }
let server: RunningServer
let planner: ApiClient
let analyst: ApiClient
let reviewer: ApiClient

interface Storyline { id: string, name: string, illustrative: boolean, rises: { year: number, rise: number }[] }
interface Outlook {
  inputHash: string
  result: { years: number[], byYear: { year: number, percentiles: { level: number, value: number }[] }[] }
}

beforeAll(async () => {
  server = await startServer()
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  analyst = await ApiClient.signedIn(server.url, ANALYST.email, ANALYST.password)
  reviewer = await ApiClient.signedIn(server.url, REVIEWER.email, REVIEWER.password)
})
afterAll(async () => { await server?.stop() })

async function kelwickOutlook(scenario: string): Promise<{ id: string, body: Outlook, storylines: Storyline[] }> {
  const sites = (await planner.get('/api/sites')).body as { id: string, name: string }[]
  const kelwick = sites.find(site => site.name === 'Kelwick')!.id
  const started = await planner.post(`/api/sites/${kelwick}/outlooks`, { scenario, samples: 20_000, seed: 4 })
  expect(started.status).toBeLessThan(300)
  const read = await planner.get(`/api/outlooks/${started.body.id}`)
  // Storylines are placed when read, beside the stored outlook: they are part of its status.
  const status = await planner.get(`/api/outlooks/${started.body.id}/status`)
  return { id: started.body.id, body: read.body as Outlook, storylines: status.body.storylines as Storyline[] }
}

describe('high-end storylines', () => {
  it('shows the demo storyline beside an outlook of its scenario, placed at the site and marked illustrative', async () => {
    const { body, storylines } = await kelwickOutlook('SSP5-8.5')
    expect(storylines).toHaveLength(1)
    const [storyline] = storylines
    expect(storyline!.name).toBe('Early ice-sheet collapse (illustrative)')
    expect(storyline!.illustrative).toBe(true)
    const at2100 = storyline!.rises.find(r => r.year === 2100)!.rise
    const year = body.result.byYear.find(y => y.year === 2100)!
    const p50 = year.percentiles.find(p => p.level === 0.5)!.value
    // [practice] the storyline adds about 0.95 − 0.12 ≈ 0.8 m of Antarctic and 0.3 − 0.09 ≈ 0.2 m of Greenland
    // ice above the middle estimates (times Kelwick's scale factors), so it lies far above the median.
    expect(at2100).toBeGreaterThan(p50 + 0.5)
    // A storyline reaching past its last anchor year (2150) is not extended.
    expect(Math.max(...storyline!.rises.map(r => r.year))).toBeLessThanOrEqual(2150)
    // Other scenarios have none.
    expect((await kelwickOutlook('SSP2-4.5')).storylines).toEqual([])
  })

  it('is reviewed like a release, and publishing one changes no outlook', async () => {
    const before = await kelwickOutlook('SSP2-4.5')
    const operator = await ApiClient.signedIn(server.url, OPERATOR.email, OPERATOR.password)
    const recomputations = async () =>
      ((await operator.get('/api/admin/recomputations')).body.recomputations as unknown[]).length
    const queuedBefore = await recomputations()
    const draft = await analyst.post('/api/storylines', {
      scenario: 'SSP2-4.5',
      name: 'Fast Greenland melt (test)',
      description: 'Greenland outlet glaciers speed up.',
      baselineYear: 2020,
      anchorYears: [2050, 2100],
      values: { greenland: [0.1, 0.6] },
      ...PROVENANCE,
    })
    expect(draft.status).toBe(201)
    expect((await analyst.post(`/api/storylines/${draft.body.id}/submit`)).status).toBe(200)
    // The author may not approve their own work.
    const own = await analyst.post(`/api/storylines/${draft.body.id}/approve`)
    expect(own.status).toBe(403)
    expect((await reviewer.post(`/api/storylines/${draft.body.id}/approve`)).status).toBe(200)

    const after = await kelwickOutlook('SSP2-4.5')
    // The same outlook is served from the store: the storyline is not an input of the Monte Carlo.
    expect(after.id).toBe(before.id)
    expect(after.body.inputHash).toBe(before.body.inputHash)
    expect(after.storylines.map(s => s.name)).toEqual(['Fast Greenland melt (test)'])
    expect(after.storylines[0]!.rises.map(r => r.year).at(-1)).toBe(2100)
    // No recomputation was queued for it.
    expect(await recomputations()).toBe(queuedBefore)
  })

  it('refuses values that do not match the anchor years, naming the field', async () => {
    const response = await analyst.post('/api/storylines', {
      scenario: 'SSP2-4.5',
      name: 'Broken',
      description: 'x',
      baselineYear: 2020,
      anchorYears: [2050, 2100],
      values: { antarctica: [0.5] },
      ...PROVENANCE,
    })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/^values\.antarctica: Give one value per anchor year \(2\)\./)
    const none = await analyst.post('/api/storylines', {
      scenario: 'SSP2-4.5',
      name: 'Empty',
      description: 'x',
      baselineYear: 2020,
      anchorYears: [2100],
      values: {},
      ...PROVENANCE,
    })
    expect(none.status).toBe(400)
    expect(none.body.message).toMatch(/^values: Name at least one component/)
    expect(((await analyst.get('/api/storylines')).body as { name: string }[]).map(s => s.name)).not.toContain('Broken')
  })
})
