import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, PORT_PLANNER, READER, demoUser } from '../support/demo-users'
import { ROOT, startServer, type RunningServer } from '../support/server'

// The overview's "waiting for you": read from what is stored, scoped to the caller's organisation,
// and each item gone once it is dealt with. A review date can only be set in the future, so the
// server runs on a clock moved to 15 January of this year, and is restarted on the same database a
// year later to see a review fall due and pass (tests/support/fake-clock.mjs).

const REVIEWER = demoUser('reviewer@saltglass.example')
const FAKE_CLOCK = `--import=${resolve(ROOT, 'tests/support/fake-clock.mjs')}`
const THIS_YEAR = new Date().getUTCFullYear()

interface Item { kind: string, siteName?: string, measureName?: string, overdue?: boolean, title?: string }

let folder: string
let server: RunningServer
let planner: ApiClient
async function startIn(year: number) {
  await server?.stop()
  server = await startServer({
    PGLITE_DATA_DIR: join(folder, 'pglite'),
    BRINKWATER_FAKE_YEAR: String(year),
    NODE_OPTIONS: FAKE_CLOCK,
  })
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
}
const waitingFor = async (client: ApiClient) => {
  const response = await client.get('/api/attention')
  expect(response.status).toBe(200)
  return response.body as Item[]
}

beforeAll(async () => {
  folder = await mkdtemp(join(tmpdir(), 'brinkwater-attention-'))
  await startIn(THIS_YEAR)
})
afterAll(async () => {
  await server?.stop()
  await rm(folder, { recursive: true, force: true })
})

describe('what is waiting', () => {
  it('asks who is asking', async () => {
    expect((await new ApiClient(server.url).get('/api/attention')).status).toBe(401)
  })

  it('lists every site of the organisation without an outlook under its planning scenario, and no other organisation\'s', async () => {
    const sites = (await planner.get('/api/sites')).body as Array<{ name: string }>
    const missing = (await waitingFor(planner)).filter(item => item.kind === 'no-planning-outlook')
    expect(missing.map(item => item.siteName)).toEqual(sites.map(site => site.name))
    // A reader of the same council is told the same; the port's planner sees only the port's sites.
    expect(await waitingFor(await ApiClient.signedIn(server.url, READER.email, READER.password))).toEqual(
      await waitingFor(planner),
    )
    const port = await waitingFor(await ApiClient.signedIn(server.url, PORT_PLANNER.email, PORT_PLANNER.password))
    expect(port.length).toBeGreaterThan(0)
    expect(port.some(item => sites.some(site => site.name === item.siteName))).toBe(false)
    expect(await waitingFor(await ApiClient.signedIn(server.url, OPERATOR.email, OPERATOR.password))).toEqual([])
  })

  it('drops a site once its planning outlook is computed, and lists decisions as their review comes due', async () => {
    const kelwick = ((await planner.get('/api/sites')).body as Array<{ id: string, name: string }>).find(
      site => site.name === 'Kelwick',
    )!
    const outlook = await planner.post(`/api/sites/${kelwick.id}/outlooks`, { scenario: 'SSP2-4.5', samples: 2_000, seed: 1 })
    expect(outlook.status).toBe(201)
    const names = (items: Item[]) => items.filter(item => item.kind === 'no-planning-outlook').map(i => i.siteName)
    expect(names(await waitingFor(planner))).not.toContain('Kelwick')

    const { pathways, measures } = (await planner.get(`/api/sites/${kelwick.id}/pathways`)).body as {
      pathways: Array<{ id: string, measureIds: string[] }>
      measures: Array<{ id: string, name: string }>
    }
    const [pathway] = pathways
    const record = (measureId: string, reviewDate: string, reviewsRecordId: string | null = null) =>
      planner.post(`/api/sites/${kelwick.id}/decisions`, {
        pathwayId: pathway!.id,
        measureId,
        scenario: 'SSP2-4.5',
        tolerance: 0.1,
        rationale: 'Council resolution (illustrative).',
        reviewDate,
        reviewsRecordId,
      })
    const nameOf = (id: string) => measures.find(m => m.id === id)!.name
    const [raise, barrier] = pathway!.measureIds.slice(1).map(nameOf)
    // It is 15 January: one review falls due in a fortnight, one next year, one the year after.
    const first = await record(pathway!.measureIds[1]!, `${THIS_YEAR}-02-01`)
    expect(first.status).toBe(201)
    expect((await record(pathway!.measureIds[2]!, `${THIS_YEAR + 1}-02-01`)).status).toBe(201)
    expect((await record(pathway!.measureIds[3]!, `${THIS_YEAR + 2}-02-01`)).status).toBe(201)
    const reviews = async () => (await waitingFor(planner)).filter(item => item.kind === 'decision-review')
    // Only the review within the 60-day notice is listed.
    expect(await reviews()).toMatchObject([{ siteName: 'Kelwick', measureName: raise, overdue: false }])

    // A year later, on the same database: the first review has passed, the second is due.
    await startIn(THIS_YEAR + 1)
    expect(await reviews()).toMatchObject([
      { siteName: 'Kelwick', measureName: raise, overdue: true },
      { siteName: 'Kelwick', measureName: barrier, overdue: false },
    ])

    // Recording the review replaces the overdue decision with one reviewed later; the list follows.
    expect((await record(pathway!.measureIds[1]!, `${THIS_YEAR + 3}-01-01`, first.body.id)).status).toBe(201)
    expect((await reviews()).map(item => item.measureName)).toEqual([barrier])
  })

  it('shows an analyst a colleague\'s submitted record to review, never their own', async () => {
    const analyst = await ApiClient.signedIn(server.url, ANALYST.email, ANALYST.password)
    const reviewer = await ApiClient.signedIn(server.url, REVIEWER.email, REVIEWER.password)
    const [current] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP2-4.5&state=published')).body
    const draft = await analyst.post('/api/releases', {
      seriesId: current.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.06, 0.16, 0.22],
      sd: [0.01, 0.03, 0.04],
      method: 'm',
      citation: 'Glaciers, awaiting review',
      licence: 'l',
    })
    expect(draft.status).toBe(201)
    // A draft is not waiting for anyone else yet.
    expect(await waitingFor(reviewer)).toEqual([])
    expect((await analyst.post(`/api/releases/${draft.body.id}/submit`)).status).toBe(200)
    expect(await waitingFor(reviewer)).toMatchObject([{ kind: 'awaiting-review', title: current.title }])
    expect(await waitingFor(analyst)).toEqual([])
    expect((await waitingFor(planner)).some(item => item.kind === 'awaiting-review')).toBe(false)
    expect((await reviewer.post(`/api/releases/${draft.body.id}/approve`)).status).toBe(200)
    expect(await waitingFor(reviewer)).toEqual([])
  })
})
