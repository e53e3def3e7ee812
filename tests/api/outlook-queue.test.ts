import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER, PORT_PLANNER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// Fair share of computing between organisations: outlooks wait in one queue, served organisation
// by organisation (the one served longest ago first), and each organisation may have only so many
// requested outlooks waiting or computing at once.

const QUOTA = 4
let server: RunningServer
let council: ApiClient
let port: ApiClient
let councilSite: string
let portSite: string

interface Listed { id: string, state: string, createdAt: string, finishedAt: string | null }

async function finished(api: ApiClient, siteId: string, ids: string[]) {
  let rows: Listed[] = []
  await expect.poll(async () => {
    rows = ((await api.get(`/api/sites/${siteId}/outlooks`)).body as Listed[]).filter(row => ids.includes(row.id))
    return rows.every(row => row.state === 'done')
  }, { timeout: 120_000, interval: 250 }).toBe(true)
  return rows.map(row => ({ asked: Date.parse(row.createdAt), done: Date.parse(row.finishedAt!) }))
}

beforeAll(async () => {
  server = await startServer({ OUTLOOK_QUEUE_PER_ORGANISATION: String(QUOTA) })
  council = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  port = await ApiClient.signedIn(server.url, PORT_PLANNER.email, PORT_PLANNER.password)
  councilSite = (await council.get('/api/sites')).body[0].id
  portSite = (await port.get('/api/sites')).body[0].id
})
afterAll(async () => { await server?.stop() })

describe('the outlook queue', () => {
  it('serves another organisation\'s small outlook before one organisation\'s backlog, and refuses past the quota with a message', async () => {
    // The council queues its whole quota of large outlooks, one after another without waiting.
    const backlog: string[] = []
    for (let seed = 1; seed <= QUOTA; seed++) {
      const queued = await council.post(`/api/sites/${councilSite}/outlooks`, {
        scenario: 'SSP2-4.5',
        samples: 1_000_000,
        seed: 100 + seed,
        wait: false,
      })
      expect(queued.status).toBe(202)
      backlog.push(queued.body.id)
    }
    // One more is refused, saying why and what to do.
    const refused = await council.post(`/api/sites/${councilSite}/outlooks`, {
      scenario: 'SSP2-4.5',
      samples: 1000,
      seed: 999,
      wait: false,
    })
    expect(refused.status).toBe(429)
    expect(refused.body.message).toBe(
      `Your organisation already has ${QUOTA} outlooks waiting or computing, the most it may queue at once (${QUOTA}). Wait for one of them to finish, then ask again; stored outlooks open at once.`,
    )
    expect(refused.body.data).toEqual({ waiting: QUOTA, quota: QUOTA })

    // The harbour board's small outlook is not held to the council's quota, and goes next.
    const small = await port.post(`/api/sites/${portSite}/outlooks`, {
      scenario: 'SSP2-4.5',
      samples: 2000,
      seed: 7,
      wait: false,
    })
    expect(small.status).toBe(202)
    const [portRun] = await finished(port, portSite, [small.body.id])
    const councilRuns = await finished(council, councilSite, backlog)
    // Served in turn: of the council's backlog, only what had finished before the harbour board
    // asked, and the one being computed when it asked, may finish before its outlook does.
    const doneBeforeItAsked = councilRuns.filter(run => run.done < portRun!.asked).length
    expect(councilRuns.filter(run => run.done <= portRun!.done).length).toBeLessThanOrEqual(doneBeforeItAsked + 1)
    expect(councilRuns.filter(run => run.done > portRun!.done).length).toBeGreaterThan(0)

    // With the backlog done, the council may queue again.
    expect(
      (await council.post(`/api/sites/${councilSite}/outlooks`, { scenario: 'SSP2-4.5', samples: 1000, seed: 999 }))
        .status,
    ).toBe(201)
  }, 180_000)
})
