import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// Signposts through the API: the demo pathway's first decision under the site's outlook, watched
// through its own gauge record's noise; the refusals say what to fix, and another organisation's
// planner finds nothing.

interface Point { threshold: number, fired: number, timely: number, late: number, missed: number, needless: number }
interface Signposts {
  scenario: string
  outlookId: string
  measure: { id: string, height: number, kind: string, tolerance: number | null }
  next: { id: string, leadTimeYears: number }
  trajectories: number
  epoch: number
  horizon: number
  tipped: number
  noise: { sd: number, phi: number, source: string }
  curves: Array<{ year: number, points: Point[] }>
}

let server: RunningServer
let planner: ApiClient
let siteId: string
let pathway: { id: string, measureIds: string[] }
const path = (query: string) => `/api/sites/${siteId}/signposts?${query}`

beforeAll(async () => {
  server = await startServer()
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick').id
  pathway = (await planner.get(`/api/sites/${siteId}/pathways`)).body.pathways[0]
  const outlook = await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 3 })
  expect(outlook.status).toBeLessThan(300)
  await vi.waitFor(async () => {
    const status = (await planner.get(`/api/outlooks/${outlook.body.id}/status`)).body
    if (status.state !== 'done') throw new Error(`outlook ${status.state}`)
  }, { timeout: 50_000, interval: 200 })
})
afterAll(async () => {
  await server?.stop()
})

describe('signposts', () => {
  it('gives the trade-off of a gauge-rate signal for the demo pathway\'s first decision', async () => {
    const query = `pathway=${pathway.id}&measure=${pathway.measureIds[0]}`
    const response = await planner.get(path(query))
    expect(response.status).toBe(200)
    const body = response.body as Signposts
    expect(body.scenario).toBe('SSP2-4.5')
    expect(body.next.id).toBe(pathway.measureIds[1])
    expect(body.trajectories).toBeGreaterThan(1000)
    // Three signal years a decade apart, the first at least five years after the epoch.
    expect(body.curves.map(c => c.year)).toEqual([2030, 2040, 2050])
    // The noise is the site's own gauge record's (Kelwick has one in the demo).
    const gauge = (await planner.get(`/api/sites/${siteId}/gauge-record`)).body.record.fit
    expect(body.noise).toEqual({ sd: gauge.residualSd, phi: gauge.phi, source: 'gauge-record' })
    for (const curve of body.curves) {
      expect(curve.points.length).toBeGreaterThan(5)
      for (const [k, p] of curve.points.entries()) {
        // Every trajectory that tips is timely, late or missed; every firing one tips or is needless.
        expect(p.timely + p.late + p.missed).toBeCloseTo(body.tipped, 9)
        expect(p.fired).toBeCloseTo(p.timely + p.late + p.needless, 9)
        if (k > 0) {
          expect(p.threshold).toBeGreaterThan(curve.points[k - 1]!.threshold)
          expect(p.missed).toBeGreaterThanOrEqual(curve.points[k - 1]!.missed)
          expect(p.needless).toBeLessThanOrEqual(curve.points[k - 1]!.needless)
        }
      }
    }
    // A reader of the organisation sees the same figures.
    const reader = await ApiClient.signedIn(server.url, READER.email, READER.password)
    expect((await reader.get(path(query))).body).toEqual(body)
  })

  it('takes the signal years asked for', async () => {
    const r = await planner.get(path(`pathway=${pathway.id}&measure=${pathway.measureIds[0]}&years=2045,2035`))
    expect(r.status).toBe(200)
    expect((r.body as Signposts).curves.map(c => c.year)).toEqual([2035, 2045])
  })

  it('answers 401 without a session and 404 to another organisation', async () => {
    const query = `pathway=${pathway.id}&measure=${pathway.measureIds[0]}`
    const anonymous = new ApiClient(server.url)
    expect((await anonymous.get(path(query))).status).toBe(401)
    const port = await ApiClient.signedIn(server.url, PORT_PLANNER.email, PORT_PLANNER.password)
    const r = await port.get(path(query))
    expect(r.status).toBe(404)
    expect(r.body.message).toBe('No such site.')
  })

  it.each([
    ['no pathway', () => `measure=${pathway.measureIds[0]}`, /^pathway: /],
    ['a pathway that is not an id', () => `pathway=abc&measure=${pathway.measureIds[0]}`, /^pathway: Choose a pathway/],
    ['signal years that are not years', () => `pathway=${pathway.id}&measure=${pathway.measureIds[0]}&years=soon`,
      /^years: List signal years/],
    ['a signal year too soon after the epoch', () => `pathway=${pathway.id}&measure=${pathway.measureIds[0]}&years=2022`,
      /^years: Give signal years from 2025 \(5 years of record after the epoch\) to \d{4}/],
    ['the pathway\'s last measure', () => `pathway=${pathway.id}&measure=${pathway.measureIds.at(-1)}`,
      /^measure: The last measure of a pathway has no next measure/],
  ])('refuses %s with a 400 that says what to fix', async (_name, query, message) => {
    const r = await planner.get(path(query()))
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(message)
  })

  describe('for a flood-level measure', () => {
    let flood: { id: string, measureIds: string[] }
    let outlookInput: { gumbel: { location: number, scale: number }, datum?: { offset: number } }

    beforeAll(async () => {
      const measure = async (body: Record<string, unknown>) =>
        (await planner.post(`/api/sites/${siteId}/measures`, body)).body.id as string
      const wall = await measure({ name: 'Sea wall crest at 2.3 m', height: 2.3, kind: 'flood-level', leadTimeYears: 0 })
      const retreat = await measure({ name: 'Move the quay inland', height: null, leadTimeYears: 15 })
      const made = await planner.post(`/api/sites/${siteId}/pathways`, {
        name: 'Hold the wall, then retreat', measureIds: [wall, retreat], tolerances: [0.1, 0.5],
      })
      expect(made.status).toBe(201)
      flood = { id: made.body.id, measureIds: [wall, retreat] }
      const outlookId = (await planner.get(path(`pathway=${pathway.id}&measure=${pathway.measureIds[0]}`))).body.outlookId
      outlookInput = (await planner.get(`/api/outlooks/${outlookId}`)).body.input
    })

    const floodQuery = (extra = '') => `pathway=${flood.id}&measure=${flood.measureIds[0]}${extra}`

    it('tips where the Gumbel chance passes the tolerance: as a mean-sea-level height at the rise that passes it', async () => {
      const r = await planner.get(path(floodQuery()))
      expect(r.status).toBe(200)
      const body = r.body as Signposts
      // The pathway's first tolerance unless another is asked for.
      expect(body.measure).toMatchObject({ kind: 'flood-level', tolerance: 0.1 })
      // [textbook: Coles 2001, §3.1.3] 1 − F(H − r) > p ⟺ r > H − μ + λ·ln(−ln(1 − p)), with the outlook's own
      // Gumbel statistics (above mean sea level at the epoch) and the level less the datum offset.
      const offset = outlookInput.datum?.offset ?? 0
      const { location, scale } = outlookInput.gumbel
      const passing = 2.3 - offset - location + scale * Math.log(-Math.log(1 - 0.1))
      const height = await planner.post(`/api/sites/${siteId}/measures`, {
        name: 'The same, as mean sea level', height: passing + offset, leadTimeYears: 0,
      })
      const retreat = (await planner.post(`/api/sites/${siteId}/measures`, {
        name: 'Retreat after it', height: null, leadTimeYears: 15,
      })).body.id
      const twin = await planner.post(`/api/sites/${siteId}/pathways`, {
        name: 'Mean-sea-level twin', measureIds: [height.body.id, retreat],
      })
      const same = (await planner.get(path(`pathway=${twin.body.id}&measure=${height.body.id}`))).body as Signposts
      expect(same.measure.tolerance).toBeNull()
      expect(body.tipped).toBeGreaterThan(0)
      expect(body.tipped).toBe(same.tipped)
      expect(body.curves).toEqual(same.curves)
    })

    it('tips no earlier at a higher tolerance, so the same signal is too late less often', async () => {
      const years = '&years=2030,2040'
      const low = (await planner.get(path(floodQuery(`${years}&tolerance=0.1`)))).body as Signposts
      const high = (await planner.get(path(floodQuery(`${years}&tolerance=0.5`)))).body as Signposts
      expect(high.measure.tolerance).toBe(0.5)
      expect(high.tipped).toBeLessThanOrEqual(low.tipped)
      const lateness = (s: Signposts) => s.curves.flatMap(c => c.points.map(p => p.late + p.missed))
      const thresholds = (s: Signposts) => s.curves.map(c => c.points.map(p => p.threshold))
      // The same gauge, so the same thresholds and firing; only the tipping years move.
      expect(thresholds(high)).toEqual(thresholds(low))
      lateness(high).forEach((share, k) => expect(share).toBeLessThanOrEqual(lateness(low)[k]! + 1e-12))
      expect(lateness(high).reduce((a, b) => a + b)).toBeLessThan(lateness(low).reduce((a, b) => a + b))
    })

    it('refuses a tolerance that is not a chance', async () => {
      const r = await planner.get(path(floodQuery('&tolerance=10')))
      expect(r.status).toBe(400)
      expect(r.body.message).toMatch(/^tolerance: A tolerance is at most 0\.99/)
    })
  })

  it('answers 404 for a scenario the site has no outlook of', async () => {
    const r = await planner.get(path(`pathway=${pathway.id}&measure=${pathway.measureIds[0]}&scenario=SSP1-1.9`))
    expect(r.status).toBe(404)
    expect(r.body.message).toMatch(/No finished outlook of this site under SSP1-1\.9/)
  })
})
