import { resolve } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER } from '../support/demo-users'
import { SITE_BODY } from '../support/matrix-fixtures'
import { ROOT, startServer, type RunningServer } from '../support/server'

// Rise is counted from a site's fixed reference epoch, never from the calendar year: the same site and
// science give the same outlook, byte for byte, whether it is computed in 2026 or in 2031. Each server
// runs with its clock moved to that year (tests/support/fake-clock.mjs).
const FAKE_CLOCK = `--import=${resolve(ROOT, 'tests/support/fake-clock.mjs')}`
const servers: RunningServer[] = []

async function outlookComputedIn(year: number) {
  const server = await startServer({ BRINKWATER_FAKE_YEAR: String(year), NODE_OPTIONS: FAKE_CLOCK })
  servers.push(server)
  const planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  const site = (
    await planner.post('/api/sites', {
      ...SITE_BODY('Calendar Point'),
      gumbel: { location: 1.5, scale: 0.12 },
      thresholds: [
        { label: 'Quay', height: 0.5 },
        { label: 'Wall', height: 2.2, kind: 'flood-level', buildYear: 2030, designLifeYears: 40 },
      ],
    })
  ).body
  const started = await planner.post(`/api/sites/${site.id}/outlooks`, {
    scenario: 'SSP2-4.5',
    samples: 20_000,
    seed: 11,
  })
  const outlook = (await planner.get(`/api/outlooks/${started.body.id}`)).body
  // Threshold ids are made by each server's database; name them by position to compare the two.
  const ids: string[]
    = site.thresholds?.map((t: { id: string }) => t.id)
      ?? (await planner.get(`/api/sites/${site.id}`)).body.thresholds.map((t: { id: string }) => t.id)
  const named = (json: string) => ids.reduce((text, id, i) => text.replaceAll(id, `threshold-${i}`), json)
  return { ...outlook, input: named(JSON.stringify(outlook.input)), result: named(JSON.stringify(outlook.result)) }
}

let in2026: Awaited<ReturnType<typeof outlookComputedIn>>
let in2031: Awaited<ReturnType<typeof outlookComputedIn>>
beforeAll(async () => {
  in2026 = await outlookComputedIn(2026)
  in2031 = await outlookComputedIn(2031)
})
afterAll(async () => { await Promise.all(servers.map(server => server.stop())) })

describe('outlooks do not depend on the calendar', () => {
  it('gives the same engine input and the same result, byte for byte, in 2026 and in 2031', () => {
    expect(in2026.state).toBe('done')
    expect(in2031.input).toBe(in2026.input)
    expect(in2031.result).toBe(in2026.result)
    expect(JSON.parse(in2026.result).years[0]).toBe(2020)
  })

  it('really ran the two servers in different years', () => {
    // An outlook's finishing time is stamped by its server's clock.
    expect(new Date(in2026.finishedAt).getUTCFullYear()).toBe(2026)
    expect(new Date(in2031.finishedAt).getUTCFullYear()).toBe(2031)
  })
})
