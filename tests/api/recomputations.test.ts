import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import type { StoredCause } from '../../shared/types/causes'
import { causeSentence } from '../../shared/wording/causes'

// New science queues a recomputation of every site with an outlook of its scenario: one durable
// job per site, outlooks computed by whichever instance claims them, progress visible to admins.

const REVIEWER = demoUser('reviewer@saltglass.example')
let server: RunningServer
let admin: ApiClient
let planner: ApiClient

interface Recomputation {
  id: string
  scenario: string | null
  siteCount: number
  done: number
  failed: number
  pending: number
  finishedAt: string | null
  cause: StoredCause
}

/** Polls the operator's list until the recomputation has finished. */
function finished(id: string) {
  return vi.waitFor(async () => {
    const row = ((await admin.get('/api/admin/recomputations')).body.recomputations as Recomputation[]).find(
      r => r.id === id,
    )
    if (!row?.finishedAt) throw new Error('still running')
    return row
  }, { timeout: 30_000, interval: 100 })
}

/** A watch confirmed through the link its e-mail carries, read from the stand-in mailbox. */
async function watchConfirmed(email: string, siteId: string) {
  expect((await planner.post('/api/watches', { email, siteId })).status).toBeLessThan(300)
  const mail = await vi.waitFor(async () => {
    const found = ((await admin.get('/api/admin/mailbox')).body as Array<{ to: string[], text: string }>).find(
      message => message.to.includes(email),
    )
    if (!found) throw new Error('not sent yet')
    return found
  }, { timeout: 20_000, interval: 100 })
  const token = mail.text.match(/\/watches\/confirm\?token=([\w-]+)/)![1]
  expect((await new ApiClient(server.url).post('/api/watches/confirm', { token })).status).toBe(200)
}

beforeAll(async () => {
  server = await startServer({ JOBS_POLL_MS: '100' })
  admin = await ApiClient.signedIn(server.url, OPERATOR.email, OPERATOR.password)
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
})
afterAll(async () => { await server?.stop() })

describe('recomputations', () => {
  let siteIds: string[]

  beforeAll(async () => {
    siteIds = ((await planner.get('/api/sites')).body as Array<{ id: string }>).slice(0, 3).map(site => site.id)
    for (const id of siteIds) {
      const outlook = await planner.post(`/api/sites/${id}/outlooks`, {
        scenario: 'SSP2-4.5',
        samples: 20_000,
        seed: 3,
      })
      expect(outlook.status).toBe(201)
    }
  })

  it('recomputes every site with an outlook of the scenario after a publication, and shows the progress to admins', async () => {
    const analyst = await ApiClient.signedIn(server.url, ANALYST.email, ANALYST.password)
    const reviewer = await ApiClient.signedIn(server.url, REVIEWER.email, REVIEWER.password)
    const [glaciers] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP2-4.5&state=published')).body
    const next = await analyst.post('/api/releases', {
      seriesId: glaciers.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.07, 0.13, 0.18],
      sd: [0.01, 0.03, 0.04],
      method: 'm',
      citation: 'c',
      licence: 'l',
    })
    await analyst.post(`/api/releases/${next.body.id}/submit`)
    // Before approving, the reviewer is told how far it reaches: the sites the batch below computes
    // again, and the confirmed watches on them (a watch still waiting for its confirmation is not mailed).
    await watchConfirmed('reach@example.org', siteIds[0]!)
    expect(
      (await planner.post('/api/watches', { email: 'pending@example.org', siteId: siteIds[1] })).status,
    ).toBeLessThan(300)
    // The new version keeps every anchor year, so no outlook loses one.
    expect((await reviewer.get(`/api/releases/${next.body.id}/reach`)).body).toEqual({
      sites: siteIds.length,
      watchers: 1,
      anchorYears: { dropped: [], horizon: null, sitesRelying: 0 },
    })
    // A published release is not waiting for approval: it has no reach to confirm.
    expect((await reviewer.get(`/api/releases/${glaciers.id}/reach`)).status).toBe(409)
    expect((await reviewer.post(`/api/releases/${next.body.id}/approve`)).status).toBe(200)

    const batch = await vi.waitFor(
      async () => {
        const list = (await admin.get('/api/admin/recomputations')).body.recomputations as Recomputation[]
        const row = list.find(r => r.scenario === 'SSP2-4.5')
        if (!row) throw new Error('not queued yet')
        return row
      },
      { timeout: 10_000, interval: 100 },
    )
    expect(batch.siteCount).toBe(siteIds.length)
    // The cause is stored as facts; the page words it in the reader's language (tests/unit/wording/catalogue.test.ts).
    expect(batch.cause).toMatchObject({ kind: 'release', action: 'published', version: 2, scenario: 'SSP2-4.5' })
    expect(causeSentence(batch.cause, 'en')).toMatch(
      /A new release for .* \(version 2, SSP2-4\.5\) changes the outlook/,
    )

    const done = await finished(batch.id)
    expect(done).toMatchObject({ done: siteIds.length, failed: 0, pending: 0 })
    for (const id of siteIds) {
      const outlooks = (await planner.get(`/api/sites/${id}/outlooks`)).body as Array<{
        id: string
        state: string
        seed: number
      }>
      // The old outlook is kept, and exactly one new one was computed with the same seed.
      expect(outlooks.filter(o => o.seed === 3).map(o => o.state)).toEqual(['done', 'done'])
      const latest = (await planner.get(`/api/outlooks/${outlooks[0]!.id}`)).body
      expect(latest.releaseRefs.find((r: { component: string }) => r.component === 'glaciers').version).toBe(2)
      expect((await planner.get(`/api/outlooks/${outlooks[0]!.id}/status`)).body.newerScience).toEqual([])
      expect(latest).not.toHaveProperty('claimedBy')
    }
  })

  it('lets the operator recompute a scenario, leaving outlooks whose inputs have not changed alone', async () => {
    const started = await admin.post('/api/admin/recomputations', { scenario: 'SSP2-4.5' })
    expect(started.status).toBe(202)
    const done = await finished(started.body.id)
    expect(done).toMatchObject({ siteCount: siteIds.length, done: siteIds.length, failed: 0 })
    for (const id of siteIds) {
      expect(((await planner.get(`/api/sites/${id}/outlooks`)).body as unknown[]).length).toBe(2)
    }
    const audit = (await admin.get('/api/admin/audit')).body as Array<{ action: string, targetId: string }>
    expect(audit.find(entry => entry.action === 'recomputation.started')?.targetId).toBe(started.body.id)
  })

  it('refuses an unknown scenario with a message naming it, and refuses everyone but admins', async () => {
    const wrong = await admin.post('/api/admin/recomputations', { scenario: 'SSP9-9.9' })
    expect(wrong.status).toBe(400)
    expect(wrong.body.message).toMatch(/no scenario called SSP9-9\.9/)
    expect((await planner.get('/api/admin/recomputations')).status).toBe(403)
    expect((await planner.post('/api/admin/recomputations', { scenario: null })).status).toBe(403)
    expect((await new ApiClient(server.url).get('/api/admin/recomputations')).status).toBe(401)
  })
})
