import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, PORT_PLANNER, READER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { TestSmtp, isTo, linkIn } from '../support/smtp'
import type { StoredCause } from '../../shared/types/causes'
import { causeSentence } from '../../shared/wording/causes'

// Each organisation's outlooks use the science it adopted: a new version in an adopted series flows
// in (recomputed and mailed), while another series — another group's, a storyline — is only offered.

const REVIEWER = demoUser('reviewer@saltglass.example')
const SCENARIO = 'SSP2-4.5'
const REQUEST = { scenario: SCENARIO, samples: 4000, seed: 11 }
const PROVENANCE = { method: 'Adoption test method.', licence: 'CC BY 4.0' }

let server: RunningServer
let smtp: TestSmtp
let planner: ApiClient
let port: ApiClient
let analyst: ApiClient
let reviewer: ApiClient
let operator: ApiClient
let councilId: string
let portId: string
let kelwick: string
let portSite: string
let originalGlaciers: string
let storylineGlaciers: string

interface Recomputation {
  id: string
  scenario: string | null
  siteCount: number
  finishedAt: string | null
  cause: StoredCause
}

const as = (email: string, password: string) => ApiClient.signedIn(server.url, email, password)
const outlook = async (api: ApiClient, siteId: string) => {
  const response = await api.post(`/api/sites/${siteId}/outlooks`, REQUEST)
  expect(response.status, JSON.stringify(response.body)).toBeLessThan(300)
  return (await api.get(`/api/outlooks/${response.body.id}`)).body
}
const glaciersRef = (o: { releaseRefs: Array<{ component: string, seriesId: string, version: number }> }) =>
  o.releaseRefs.find(r => r.component === 'glaciers')!

/** Publishes a release through review; returns its id. */
async function publish(body: Record<string, unknown>) {
  const draft = await analyst.post('/api/releases', body)
  expect(draft.status, JSON.stringify(draft.body)).toBe(201)
  expect((await analyst.post(`/api/releases/${draft.body.id}/submit`)).status).toBe(200)
  return draft.body as { id: string, seriesId: string }
}

/** Waits for the recomputation queued by a publication whose cause, worded in English as the page does, matches. */
function recomputationFor(match: RegExp) {
  return vi.waitFor(async () => {
    const row = ((await operator.get('/api/admin/recomputations')).body.recomputations as Recomputation[]).find(r =>
      match.test(causeSentence(r.cause, 'en')),
    )
    if (!row?.finishedAt) throw new Error('not finished yet')
    return row
  }, { timeout: 30_000, interval: 100 })
}

beforeAll(async () => {
  smtp = await new TestSmtp().start()
  server = await startServer({
    SMTP_URL: smtp.url,
    JOBS_POLL_MS: '100',
    MAIL_POLL_MS: '200',
    MAIL_RETRY_BASE_MS: '200',
  }); [planner, port, analyst, reviewer, operator] = await Promise.all([
    as(PLANNER.email, PLANNER.password),
    as(PORT_PLANNER.email, PORT_PLANNER.password),
    as(ANALYST.email, ANALYST.password),
    as(REVIEWER.email, REVIEWER.password),
    as(OPERATOR.email, OPERATOR.password),
  ])
  councilId = (await planner.get('/api/me')).body.user.organisationId
  portId = (await port.get('/api/me')).body.user.organisationId
  kelwick = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick').id
  portSite = (await port.get('/api/sites')).body[0].id
  originalGlaciers = (await analyst.get(`/api/releases?component=glaciers&scenario=${SCENARIO}&state=published`))
    .body[0].seriesId
})
afterAll(async () => {
  await server?.stop()
  await smtp?.stop()
})

describe('adopted science per organisation', () => {
  let before: { id: string, inputHash: string, result: unknown }

  it('adopts the first published series at an organisation\'s first outlook, and says so on its adoption page', async () => {
    const page = (await planner.get(`/api/organisations/${councilId}/adoption`)).body
    expect(page.scenarios.find((s: { scenario: string }) => s.scenario === SCENARIO).decided).toBe(false)
    before = await outlook(planner, kelwick)
    expect(glaciersRef(before as never).seriesId).toBe(originalGlaciers)
    const adopted = (await planner.get(`/api/organisations/${councilId}/adoption`)).body.scenarios.find(
      (s: { scenario: string }) => s.scenario === SCENARIO,
    )
    expect(adopted.decided).toBe(true)
    const glaciers = adopted.components.find((c: { component: string }) => c.component === 'glaciers')
    expect(glaciers.adopted).toMatchObject({ seriesId: originalGlaciers, automatic: true, version: 1 })
    const audit = (await operator.get('/api/admin/audit?limit=50')).body as Array<{
      action: string
      detail: { scenario?: string, automatic?: boolean }
    }>
    expect(
      audit.some(
        line => line.action === 'science.adopted' && line.detail.scenario === SCENARIO && line.detail.automatic,
      ),
    ).toBe(true)
  })

  it('offers a new series (a storyline) without changing any outlook', async () => {
    const storyline = await publish({
      series: { component: 'glaciers', scenario: SCENARIO, title: 'High-end glacier storyline (illustrative)' },
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.09, 0.2, 0.3],
      sd: [0.02, 0.05, 0.07],
      citation: 'Storyline (2026).',
      ...PROVENANCE,
    })
    storylineGlaciers = storyline.seriesId
    // Nobody adopted the new series, so publishing it reaches no site.
    expect((await reviewer.get(`/api/releases/${storyline.id}/reach`)).body).toMatchObject({
      sites: 0,
      watchers: 0,
      anchorYears: { dropped: [] },
    })
    expect((await reviewer.post(`/api/releases/${storyline.id}/approve`)).status).toBe(200)
    expect((await recomputationFor(/A new release for .*\(version 1, SSP2-4\.5\)/)).siteCount).toBe(0)

    const again = await planner.post(`/api/sites/${kelwick}/outlooks`, REQUEST)
    expect(again.status).toBe(200)
    expect(again.body.id).toBe(before.id)
    const read = (await planner.get(`/api/outlooks/${before.id}`)).body
    expect(read.inputHash).toBe(before.inputHash)
    const status = (await planner.get(`/api/outlooks/${before.id}/status`)).body
    expect(status.newerScience).toEqual([])
    expect(status.offeredScience).toEqual([
      expect.objectContaining({ component: 'glaciers', seriesId: storylineGlaciers, version: 1 }),
    ])
    const glaciers = (await planner.get(`/api/organisations/${councilId}/adoption`)).body.scenarios
      .find((s: { scenario: string }) => s.scenario === SCENARIO)
      .components.find((c: { component: string }) => c.component === 'glaciers')
    expect(glaciers.adopted.seriesId).toBe(originalGlaciers)
    expect(glaciers.available.map((s: { seriesId: string }) => s.seriesId)).toEqual([storylineGlaciers])
  })

  it('leaves an organisation\'s outlooks as they are when another organisation adopts a different series', async () => {
    const portBefore = await outlook(port, portSite)
    expect(glaciersRef(portBefore as never).seriesId).toBe(originalGlaciers)
    const adopted = await port.put(`/api/organisations/${portId}/adoption`, {
      scenario: SCENARIO,
      series: { glaciers: storylineGlaciers },
    })
    expect(adopted.status, JSON.stringify(adopted.body)).toBe(200)
    expect(
      adopted.body.components.find((c: { component: string }) => c.component === 'glaciers').adopted,
    ).toMatchObject({ seriesId: storylineGlaciers, automatic: false })
    // The port's outlook page now says another series was adopted; its next outlook uses it.
    expect((await port.get(`/api/outlooks/${portBefore.id}/status`)).body.newerScience).toEqual([
      expect.objectContaining({ kind: 'adopted-other', component: 'glaciers' }),
    ])
    const portAfter = await outlook(port, portSite)
    expect(glaciersRef(portAfter as never).seriesId).toBe(storylineGlaciers)
    expect(portAfter.inputHash).not.toBe(portBefore.inputHash)

    // The council's outlook is the same stored one, with the same input hash and the same numbers.
    const again = await planner.post(`/api/sites/${kelwick}/outlooks`, REQUEST)
    expect(again.body.id).toBe(before.id)
    const read = (await planner.get(`/api/outlooks/${before.id}`)).body
    expect(read.inputHash).toBe(before.inputHash)
    expect(read.result).toEqual(before.result)
    const audit = (await operator.get('/api/admin/audit?limit=50')).body as Array<{
      action: string
      targetId: string
      actorName: string | null
      detail: { series?: Record<string, { from: string, to: string }> }
    }>
    expect(
      audit.find(line => line.action === 'science.adopted' && line.targetId === portId && line.detail.series?.glaciers),
    ).toMatchObject({
      actorName: 'Tomas Greer',
      detail: { scenario: SCENARIO, series: { glaciers: { from: originalGlaciers, to: storylineGlaciers } } },
    })
  })

  it('warns before a version drops an anchor year, recomputes only the adopting organisation, and mails the shortened horizon', async () => {
    // A confirmed watcher on the council's site.
    expect((await planner.post('/api/watches', { email: 'horizon@example.org', siteId: kelwick })).status).toBe(202)
    const confirmMail = await smtp.next(m => isTo('horizon@example.org')(m) && /Confirm/.test(m.subject ?? ''))
    const token = new URL(linkIn(confirmMail, `${server.url}/watches/confirm?token=`)).searchParams.get('token')!
    expect((await new ApiClient(server.url).post('/api/watches/confirm', { token })).status).toBe(200)
    const portOutlooks = (await port.get(`/api/sites/${portSite}/outlooks`)).body.length

    // Version 2 of the adopted series ends at 2100: it drops 2150, which the council's outlook reaches.
    const draft = await analyst.post('/api/releases', {
      seriesId: originalGlaciers,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100],
      mean: [0.06, 0.12],
      sd: [0.01, 0.03],
      citation: 'Glaciers v2 (2026).',
      ...PROVENANCE,
    })
    expect(draft.status).toBe(201)
    // The editor is told before submitting (the reach answers for a draft too) and again before approving.
    const warned = { dropped: [2150], horizon: { before: 2150, after: 2100 }, sitesRelying: 1 }
    expect((await analyst.get(`/api/releases/${draft.body.id}/reach`)).body).toEqual({
      sites: 1,
      watchers: 1,
      anchorYears: warned,
    })
    expect((await analyst.post(`/api/releases/${draft.body.id}/submit`)).status).toBe(200)
    expect((await reviewer.get(`/api/releases/${draft.body.id}/reach`)).body.anchorYears).toEqual(warned)
    expect((await reviewer.post(`/api/releases/${draft.body.id}/approve`)).status).toBe(200)

    const batch = await recomputationFor(/A new release for .*\(version 2, SSP2-4\.5\)/)
    expect(batch.siteCount).toBe(1)
    const mail = await smtp.next(m => isTo('horizon@example.org')(m) && /has changed/.test(m.subject ?? ''))
    expect(mail.subject).toBe('The sea-level outlook for Kelwick has changed')
    expect(mail.text).toContain(
      'The horizon was shortened (SSP2-4.5): the outlook reached 2150 and now reaches only 2100',
    )
    const latest = (await planner.get(`/api/sites/${kelwick}/outlooks`)).body[0]
    const recomputed = (await planner.get(`/api/outlooks/${latest.id}`)).body
    expect(glaciersRef(recomputed)).toMatchObject({ seriesId: originalGlaciers, version: 2 })
    // [practice] output years are the epoch, then each decade to the shortest release's last anchor year.
    expect(recomputed.input.years.at(-1)).toBe(2100)
    // The port adopted the storyline: nothing of it was recomputed.
    expect((await port.get(`/api/sites/${portSite}/outlooks`)).body.length).toBe(portOutlooks)
  })

  it('names what to adopt when an adopted series has nothing published', async () => {
    const [storyline] = (
      await analyst.get(`/api/releases?component=glaciers&scenario=${SCENARIO}&state=published`)
    ).body.filter((r: { seriesId: string }) => r.seriesId === storylineGlaciers)
    expect((await reviewer.post(`/api/releases/${storyline.id}/withdraw`, { reason: 'Adoption test.' })).status).toBe(
      200,
    )
    const refused = await port.post(`/api/sites/${portSite}/outlooks`, { ...REQUEST, seed: 12 })
    expect(refused.status).toBe(400)
    expect(refused.body.message).toMatch(
      /^scenario: The series your organisation adopted for glaciers under SSP2-4\.5 has no published version now \(withdrawn\): adopt another/,
    )
    expect(refused.body.message).toContain('"Mountain glaciers (illustrative)"')
  })

  it('ties a correlation set to the series it was made for, and warns an outlook that uses it with others', async () => {
    const science = (await operator.get('/api/organisations')).body.find(
      (o: { kind: string }) => o.kind === 'science',
    ).id
    const body = {
      scenario: SCENARIO,
      title: 'Glaciers and Greenland (adoption test)',
      components: ['glaciers', 'greenland'],
      matrix: [
        [1, 0.3],
        [0.3, 1],
      ],
      citation: 'Set (2026).',
      ...PROVENANCE,
    }
    const made = await analyst.post('/api/correlation-sets', body)
    expect(made.status, JSON.stringify(made.body)).toBe(201)
    const set = (await analyst.get(`/api/correlation-sets/${made.body.id}`)).body
    const greenland = (await analyst.get(`/api/releases?component=greenland&scenario=${SCENARIO}&state=published`))
      .body[0].seriesId
    expect(set.madeForSeries).toEqual({ glaciers: originalGlaciers, greenland })
    await analyst.post(`/api/correlation-sets/${made.body.id}/submit`)
    expect((await reviewer.post(`/api/correlation-sets/${made.body.id}/approve`)).status).toBe(200)

    // The port takes the original glaciers back and the science group's set: they match, no warning.
    const adopted = await port.put(`/api/organisations/${portId}/adoption`, {
      scenario: SCENARIO,
      series: { glaciers: originalGlaciers },
      correlation: science,
    })
    expect(adopted.status, JSON.stringify(adopted.body)).toBe(200)
    expect(adopted.body.correlation).toMatchObject({ decided: true, otherSeries: [], adopted: { id: made.body.id } })
    const matching = await outlook(port, portSite)
    expect(matching.correlationSetId).toBe(made.body.id)
    expect(matching.notes).not.toContainEqual(expect.objectContaining({ kind: 'correlation-other-series' }))

    // A set that names another series of glaciers is applied all the same, and the outlook says so.
    const storyline = await publish({
      seriesId: storylineGlaciers,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.09, 0.2, 0.3],
      sd: [0.02, 0.05, 0.07],
      citation: 'Storyline v2 (2026).',
      ...PROVENANCE,
    })
    expect((await reviewer.post(`/api/releases/${storyline.id}/approve`)).status).toBe(200)
    const switched = await port.put(`/api/organisations/${portId}/adoption`, {
      scenario: SCENARIO,
      series: { glaciers: storylineGlaciers },
    })
    expect(switched.body.correlation.otherSeries).toEqual(['glaciers'])
    const warned = await outlook(port, portSite)
    expect(warned.correlationSetId).toBe(made.body.id)
    expect(warned.notes).toContainEqual({ kind: 'correlation-other-series', components: ['glaciers'] })
  })

  it('lets readers read the adoption but not change it, and refuses what cannot be adopted with the field named', async () => {
    const reader = await as(READER.email, READER.password)
    expect((await reader.get(`/api/organisations/${councilId}/adoption`)).status).toBe(200)
    expect((await reader.put(`/api/organisations/${councilId}/adoption`, { scenario: SCENARIO })).status).toBe(403)
    expect((await planner.get(`/api/organisations/${portId}/adoption`)).status).toBe(404)
    const audit = async () => (await operator.get('/api/admin/audit?limit=5')).body
    const was = await audit()
    const greenland = await planner.put(`/api/organisations/${councilId}/adoption`, {
      scenario: SCENARIO,
      series: { greenland: originalGlaciers },
    })
    expect(greenland.status).toBe(400)
    expect(greenland.body.message).toBe(
      'series.greenland: This series is of glaciers, not greenland; choose a series of greenland.',
    )
    const nowhere = await planner.put(`/api/organisations/${councilId}/adoption`, { scenario: 'SSP3-7.0' })
    expect(nowhere.body.message).toMatch(/^scenario: Nothing is published under SSP3-7\.0/)
    expect(await audit()).toEqual(was)
  })
})
