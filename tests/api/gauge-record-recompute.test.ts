import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { workSettled } from '../support/work'

// A new gauge record reaches the site's outlooks: the upload queues the latest finished outlook of
// each scenario again, watchers are told what the record changed, and an identical upload changes
// nothing.

let server: RunningServer
let operator: ApiClient
let planner: ApiClient
let siteId: string
let firstOutlookId: string

interface Listed { id: string, scenario: string, state: string, seed: number, samples: number }
interface MailboxMessage { to: string[], subject: string, text: string }

const WATCHER = 'harbour-watcher@example.org'
const SLIPWAY_WATCHER = 'slipway-watcher@example.org'

/** Annual means 1981–2025 rising 4 mm/yr through 1.20 m in 2020 above the datum, with a small wobble. */
const RECORD = `year,height\n${Array.from({ length: 45 }, (_, i) => 1981 + i)
  .map(year => `${year},${(1.2 + 0.004 * (year + 0.5 - 2020) + (year % 2 ? 0.004 : -0.004)).toFixed(4)}`)
  .join('\n')}\n`

const outlooksOfSite = async () => (await planner.get(`/api/sites/${siteId}/outlooks`)).body as Listed[]
const mailbox = async () => (await operator.get('/api/admin/mailbox')).body as MailboxMessage[]
const changeMails = async () => (await mailbox()).filter(m => m.to.includes(WATCHER) && /has changed/.test(m.subject))

/** `email` watches the site, confirmed through the link its mail carries. */
async function watch(email: string, site: string) {
  expect((await planner.post('/api/watches', { email, siteId: site })).status).toBeLessThan(300)
  const confirmation = await vi.waitFor(async () => {
    const found = (await mailbox()).find(m => m.to.includes(email))
    if (!found) throw new Error('not sent yet')
    return found
  }, { timeout: 20_000, interval: 100 })
  const token = confirmation.text.match(/\/watches\/confirm\?token=([\w-]+)/)![1]
  expect((await new ApiClient(server.url).post('/api/watches/confirm', { token })).status).toBe(200)
}

beforeAll(async () => {
  server = await startServer({ JOBS_POLL_MS: '100', MAIL_POLL_MS: '100' })
  operator = await ApiClient.signedIn(server.url, OPERATOR.email, OPERATOR.password)
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Lowmere').id
  const outlook = await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 })
  expect(outlook.status).toBe(201)
  firstOutlookId = outlook.body.id
  await watch(WATCHER, siteId)
  await workSettled(server.url)
})

afterAll(async () => {
  await server?.stop()
})

describe('a gauge record upload brings the site\'s outlooks up to date', () => {
  it('queues the scenario\'s latest outlook again, weighted by the record, and tells the watchers why', async () => {
    const upload = await planner.post(`/api/sites/${siteId}/gauge-record`, { csv: RECORD })
    expect(upload.status).toBe(201)
    expect(upload.body).toMatchObject({ version: 1, updatingScenarios: ['SSP2-4.5'] })

    const updated = await vi.waitFor(async () => {
      const found = (await outlooksOfSite()).find(o => o.scenario === 'SSP2-4.5' && o.id !== firstOutlookId)
      if (found?.state !== 'done') throw new Error('not computed yet')
      return found
    }, { timeout: 60_000, interval: 100 })
    // Computed again with the outlook's own seed and samples, now weighted by the record since the 2020 epoch.
    expect(updated).toMatchObject({ seed: 7, samples: 20_000 })
    const outlook = (await planner.get(`/api/outlooks/${updated.id}`)).body
    expect(outlook.input.observations.times).toEqual([2020.5, 2021.5, 2022.5, 2023.5, 2024.5, 2025.5])
    expect(outlook.result.observationUpdate).toMatchObject({ method: 'likelihood-weighting', observations: 6 })

    const [mail] = await vi.waitFor(async () => {
      const found = await changeMails()
      if (!found.length) throw new Error('not sent yet')
      return found
    }, { timeout: 20_000, interval: 100 })
    expect(mail!.text).toContain(
      'Version 1 of the tide-gauge record of Lowmere was uploaded. The projections themselves are unchanged; '
      + 'the outlooks updated by the observed record now rest on this version.',
    )
    // The updated range is new: the outlook before had no record to be weighted by. An update is given in
    // 2030, the last output year a record of 2020–2025 reaches (as long after it as it spans); a refused
    // one in the year the other ranges are given.
    expect(mail!.text).toContain('Rise updated by the tide-gauge record: middle estimate (likely range)')
    const refused = outlook.result.observationUpdate.refused
    const now = refused ? 'not given \\(too few effective samples\\)' : '-?\\d'
    const year = refused ? '2100' : '2030'
    expect(mail!.text).toMatch(new RegExp(`SSP2-4\\.5 {2}\\| {2}${year} {2}\\| {2}no update {2}\\| {2}${now}`))
  })

  it('leaves the outlooks alone, and mails no one, when the same record is uploaded again', async () => {
    await workSettled(server.url)
    const before = await outlooksOfSite()
    const mailsBefore = (await changeMails()).length
    const again = await planner.post(`/api/sites/${siteId}/gauge-record`, { csv: RECORD })
    expect(again.body).toMatchObject({ version: 2, updatingScenarios: ['SSP2-4.5'] })
    await workSettled(server.url)
    // The same input hashes the same: the stored outlook is found and nothing is computed or mailed.
    expect(await outlooksOfSite()).toEqual(before)
    expect(await changeMails()).toHaveLength(mailsBefore)
  })

  it('answers another organisation\'s planner as if the site did not exist, and refuses analysts and readers', async () => {
    const before = await outlooksOfSite()
    const as = (user: { email: string, password: string }) => ApiClient.signedIn(server.url, user.email, user.password)
    const [portPlanner, analyst, reader] = await Promise.all([as(PORT_PLANNER), as(ANALYST), as(READER)])
    expect((await portPlanner.post(`/api/sites/${siteId}/gauge-record`, { csv: RECORD })).status).toBe(404)
    expect((await analyst.post(`/api/sites/${siteId}/gauge-record`, { csv: RECORD })).status).toBe(403)
    const refused = await reader.post(`/api/sites/${siteId}/gauge-record`, { csv: RECORD })
    expect(refused.status).toBe(403)
    expect(refused.body.message).toBe('This needs the planner role.')
    await workSettled(server.url)
    expect(await outlooksOfSite()).toEqual(before)
    expect((await planner.get(`/api/sites/${siteId}/gauge-record`)).body.versions).toHaveLength(2)
  })

  it('marks an issued briefing out of date when a new record changes its gauge section', async () => {
    // A site of its own with a mark 7.8 cm above mean sea level 2020, the outlook's median rise in 2030. Its
    // record counts from the epoch (2020), so it reaches 2030 (as long after 2025 as it spans) and the
    // gauge section states 2030, where the record carries a tenth of its weight.
    const created = await planner.post('/api/sites', {
      name: 'Gauge Test Inlet',
      latitude: 48.2,
      longitude: -34.1,
      referenceLevel: 'Mean sea level 2020 at a test gauge',
      datum: { kind: 'mean-sea-level', offset: 0 },
      referenceEpoch: 2020,
      landMotion: { rateMmPerYear: 0, sigmaMmPerYear: 0.5, source: 'gps', reference: 'Test station', epoch: 2020 },
      thresholds: [{ label: 'Slipway lip', height: 0.078 }],
    })
    expect(created.status).toBe(201)
    const site = created.body.id as string
    const outlook = await planner.post(`/api/sites/${site}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 7 })
    expect(outlook.status).toBe(201)
    await watch(SLIPWAY_WATCHER, site)
    await workSettled(server.url)
    // Weather-sized noise (about a centimetre) so the trajectories' weights are spread enough for an update.
    const noisy = (rate: number) => `year,height\n${Array.from({ length: 45 }, (_, i) => 1981 + i).map((year) => {
      const t = year + 0.5 - 2020
      const wobble = 0.01 * Math.sin(year * 2.39996) + 0.006 * Math.sin(year * 0.91)
      return `${year},${(rate * t + wobble).toFixed(4)}`
    }).join('\n')}\n`
    expect((await planner.post(`/api/sites/${site}/gauge-record`, { csv: noisy(0.004) })).status).toBe(201)
    await workSettled(server.url)
    const weighted = (await planner.get(`/api/sites/${site}/outlooks`)).body
      .find((o: Listed) => o.scenario === 'SSP2-4.5' && o.state === 'done') as Listed
    const update = (await planner.get(`/api/outlooks/${weighted.id}`)).body.result.observationUpdate
    expect(update.refused).toBe(false)
    expect(update.reach).toMatchObject({ mode: 'record-length', noneFrom: 2030.5 })
    const thresholdIds = (await planner.get(`/api/sites/${site}`)).body.thresholds.map((t: { id: string }) => t.id)
    const draft = await planner.post('/api/briefings', {
      outlookId: weighted.id, title: 'The slipway and its gauge', thresholdIds, years: [2030, 2050],
    })
    expect(draft.status).toBe(201)
    expect((await planner.post(`/api/briefings/${draft.body.id}/issue`)).status).toBe(200)
    expect((await planner.get(`/api/briefings/${draft.body.id}`)).body.staleness).toBeNull()

    // 4 mm a year at issue pulls the updated chance in 2030 below one half; 8 mm a year, about the
    // outlook's own pace, takes it back up, by a few points through the tenth the record carries there.
    expect((await planner.post(`/api/sites/${site}/gauge-record`, { csv: noisy(0.008) })).status).toBe(201)
    await workSettled(server.url)
    const { staleness } = (await planner.get(`/api/briefings/${draft.body.id}`)).body
    // Only the gauge section's chance changed (in 2030, the section's year): the unweighted numbers did not.
    expect(staleness?.changes).toEqual([expect.objectContaining({
      kind: 'gauge-updated', threshold: 'Slipway lip', year: 2030, scenario: 'SSP2-4.5',
    })])
    expect(staleness.changes[0].now).toBeGreaterThan(staleness.changes[0].was)
    const stale = await vi.waitFor(async () => {
      const found = (await mailbox()).find(m => m.to.includes(PLANNER.email) && /Briefing out of date/.test(m.subject))
      if (!found) throw new Error('not sent yet')
      return found
    }, { timeout: 20_000, interval: 100 })
    expect(stale.text).toMatch(/by 2030 updated by the tide-gauge record: [\d.]+\s% now, [\d.]+\s% in this briefing\./)
    // The watcher is told the range the record updates in 2030 too, before and after, not 2100's (which
    // is the outlook's own, the record out of its reach there).
    const changed = await vi.waitFor(async () => {
      const found = (await mailbox()).find(m => m.to.includes(SLIPWAY_WATCHER) && /Version 2 of the tide-gauge/.test(m.text))
      if (!found) throw new Error('not sent yet')
      return found
    }, { timeout: 20_000, interval: 100 })
    const range = '\\d\\.\\d+ m \\(\\d\\.\\d+ m–\\d\\.\\d+ m\\)'
    expect(changed.text).toMatch(new RegExp(`SSP2-4\\.5 {2}\\| {2}2030 {2}\\| {2}${range} {2}\\| {2}${range}`))
  })
})
