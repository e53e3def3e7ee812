import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// A server killed outright (SIGKILL, no shutdown) in the middle of a write restarts consistent:
// a transaction lands whole or not at all, and work it had claimed is taken over once its lease
// runs out. BRINKWATER_FAULT makes the server kill itself at a named point inside the transaction.

const REVIEWER = demoUser('reviewer@saltglass.example')
const LEASE = { JOB_LEASE_MS: '1500', JOBS_POLL_MS: '100' }
let dataDir: string
let server: RunningServer | undefined

/** The same data folder, started again; the previous process must have ended. */
async function start(env: Record<string, string> = {}) {
  server = await startServer({ PGLITE_DATA_DIR: dataDir, ...LEASE, ...env })
  return server
}

beforeAll(async () => {
  dataDir = await mkdtemp(join(tmpdir(), 'brinkwater-faults-'))
})
afterAll(async () => {
  await server?.stop()
  await rm(dataDir, { recursive: true, force: true })
})

describe('killed mid-write', () => {
  it('an outlook whose result was being written is computed again after the restart, once', async () => {
    const crashing = await start({ BRINKWATER_FAULT: 'outlook-write' })
    const planner = await ApiClient.signedIn(crashing.url, PLANNER.email, PLANNER.password)
    const [site] = (await planner.get('/api/sites')).body
    const queued = await planner.post(`/api/sites/${site.id}/outlooks`, {
      scenario: 'SSP2-4.5',
      samples: 20_000,
      seed: 5,
      wait: false,
    })
    expect(queued.status).toBe(202)
    expect(await crashing.exited).toBeNull()

    const restarted = await start()
    const again = await ApiClient.signedIn(restarted.url, PLANNER.email, PLANNER.password)
    const outlook = await vi.waitFor(async () => {
      const body = (await again.get(`/api/outlooks/${queued.body.id}`)).body
      if (body.state === 'running') throw new Error('not yet recomputed')
      return body
    }, { timeout: 20_000, interval: 100 })
    expect(outlook.state).toBe('done')
    expect(outlook.result.samples).toBe(20_000)
    const list = (await again.get(`/api/sites/${site.id}/outlooks`)).body as Array<{ seed: number }>
    expect(list.filter(o => o.seed === 5)).toHaveLength(1)
    await restarted.stop()
  })

  it('a publication cut off inside its transaction leaves the old version published and the new one in review', async () => {
    const crashing = await start({ BRINKWATER_FAULT: 'release-publish' })
    const analyst = await ApiClient.signedIn(crashing.url, ANALYST.email, ANALYST.password)
    const reviewer = await ApiClient.signedIn(crashing.url, REVIEWER.email, REVIEWER.password)
    const [glaciers] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP5-8.5&state=published')).body
    const next = await analyst.post('/api/releases', {
      seriesId: glaciers.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.08, 0.16, 0.22],
      sd: [0.01, 0.03, 0.04],
      method: 'm',
      citation: 'c',
      licence: 'l',
    })
    await analyst.post(`/api/releases/${next.body.id}/submit`)
    await expect(reviewer.post(`/api/releases/${next.body.id}/approve`)).rejects.toThrow()
    expect(await crashing.exited).toBeNull()

    const restarted = await start()
    const after = await ApiClient.signedIn(restarted.url, REVIEWER.email, REVIEWER.password)
    expect((await after.get(`/api/releases/${next.body.id}`)).body.state).toBe('in-review')
    const published = (await after.get(`/api/releases?component=glaciers&scenario=SSP5-8.5&state=published`))
      .body as Array<{ id: string }>
    expect(published.map(r => r.id)).toEqual([glaciers.id])
    // Nothing of the cut-off transaction is left: the approval can be made again, and is audited once.
    expect((await after.post(`/api/releases/${next.body.id}/approve`)).body.state).toBe('published')
    expect((await after.get(`/api/releases/${glaciers.id}`)).body.state).toBe('superseded')
    const admin = await ApiClient.signedIn(restarted.url, OPERATOR.email, OPERATOR.password)
    const audit = (await admin.get('/api/admin/audit')).body as Array<{ action: string, targetId: string }>
    expect(audit.filter(entry => entry.action === 'release.published' && entry.targetId === next.body.id)).toHaveLength(
      1,
    )
    await restarted.stop()
  })
})
