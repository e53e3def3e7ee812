import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { PGlite } from '@electric-sql/pglite'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ADMIN, ANALYST, OPERATOR, PLANNER, READER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { TestSmtp, isTo, linkIn } from '../support/smtp'
import { formatChance } from '../../shared/wording/chance'

// An issued briefing never changes; when newer science changes the numbers it states, its pages say
// so figure by figure, each of its planners gets exactly one e-mail, and a planner can start a new
// version from the latest outlooks in one request. What is out of date is worked out when the newer
// outlooks finish and stored on the briefing: its pages only read it. The server keeps its database
// in a PGlite folder, so the last test can look at what was stored.

const REVIEWER = demoUser('reviewer@saltglass.example')
const SECOND_PLANNER = { email: 'second.planner@caldwyn.example', password: 'harbour-lichen-tide-41' }
let server: RunningServer
let smtp: TestSmtp
let author: ApiClient
let issuer: ApiClient
let briefingId: string
let shareToken: string
let outlookId: string
let siteId: string
let thresholdIds: string[]
let dataDir: string

const serverEnv = () => ({
  SMTP_URL: smtp.url,
  MAIL_POLL_MS: '200',
  MAIL_RETRY_BASE_MS: '200',
  PGLITE_DATA_DIR: join(dataDir, 'pglite'),
})
const as = (email: string, password: string) => ApiClient.signedIn(server.url, email, password)
const stale = (m: { subject?: string }) => /^Briefing out of date/.test(m.subject ?? '')

async function publishGlaciers(mean2100: number) {
  const analyst = await as(ANALYST.email, ANALYST.password)
  const reviewer = await as(REVIEWER.email, REVIEWER.password)
  const [current] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP2-4.5&state=published')).body
  const draft = await analyst.post('/api/releases', {
    seriesId: current.seriesId,
    form: 'normal',
    baselineYear: 2020,
    anchorYears: [2050, 2100, 2150],
    mean: [mean2100 / 3, mean2100, mean2100 * 1.4],
    sd: [0.01, 0.03, 0.04],
    method: 'm',
    citation: `Glaciers revised (${mean2100})`,
    licence: 'l',
  })
  await analyst.post(`/api/releases/${draft.body.id}/submit`)
  expect((await reviewer.post(`/api/releases/${draft.body.id}/approve`)).status).toBe(200)
}

async function outboxSettled() {
  const operator = await as(OPERATOR.email, OPERATOR.password)
  await expect
    .poll(
      async () =>
        (await operator.get('/api/admin/outbox')).body.messages.filter((m: { state: string }) => m.state === 'queued')
          .length,
      { timeout: 60_000 },
    )
    .toBe(0)
}

beforeAll(async () => {
  smtp = await new TestSmtp().start()
  dataDir = await mkdtemp(join(tmpdir(), 'brinkwater-staleness-'))
  server = await startServer(serverEnv())
  // Two planners: one drafts the briefing, the other issues it; both are its planners.
  const admin = await as(ADMIN.email, ADMIN.password)
  const organisationId = (await admin.get('/api/me')).body.user.organisationId
  expect(
    (
      await admin.post('/api/admin/users', {
        email: SECOND_PLANNER.email,
        name: 'Second Planner',
        role: 'planner',
        organisationId,
        password: SECOND_PLANNER.password,
      })
    ).status,
  ).toBe(201)
  author = await as(PLANNER.email, PLANNER.password)
  issuer = await as(SECOND_PLANNER.email, SECOND_PLANNER.password)
  siteId = (await author.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick').id
  thresholdIds = (await author.get(`/api/sites/${siteId}`)).body.thresholds.map((t: { id: string }) => t.id)
  outlookId = (await author.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 11 }))
    .body.id
  briefingId = (
    await author.post('/api/briefings', { outlookId, title: 'Kelwick to 2100', thresholdIds, years: [2050, 2100] })
  ).body.id
  expect((await issuer.post(`/api/briefings/${briefingId}/issue`)).status).toBe(200)
  shareToken = (await issuer.post(`/api/briefings/${briefingId}/share`)).body.shareToken
}, 120_000)
afterAll(async () => {
  await server?.stop()
  await smtp?.stop()
  if (dataDir) await rm(dataDir, { recursive: true, force: true })
})

describe('an issued briefing and newer science', () => {
  let frozen: unknown
  let latestId: string

  it('is current until the science changes', async () => {
    const view = (await author.get(`/api/briefings/${briefingId}`)).body
    expect(view.staleness).toBeNull()
    expect((await new ApiClient(server.url).get(`/api/shared/${shareToken}`)).body.staleness).toBeNull()
    frozen = view.document
  })

  it('says on its internal and shared pages which figures changed, and stays as issued', async () => {
    await publishGlaciers(0.45)
    // The recomputation queues and finishes a new outlook for the site's SSP2-4.5.
    await expect
      .poll(async () => (await author.get(`/api/briefings/${briefingId}`)).body.staleness, { timeout: 60_000 })
      .not.toBeNull()
    const view = (await author.get(`/api/briefings/${briefingId}`)).body
    expect(view.document).toEqual(frozen)
    // The overview lists it as waiting, with as many changed figures as its page shows.
    expect((await author.get('/api/attention')).body).toContainEqual(
      expect.objectContaining({ kind: 'stale-briefing', briefingId, changes: view.staleness.changes.length }),
    )
    const outlooks = (await author.get(`/api/sites/${siteId}/outlooks`)).body.filter((o: { scenario: string, seed: number, state: string }) => o.scenario === 'SSP2-4.5' && o.seed === 11 && o.state === 'done')
    latestId = outlooks[0].id
    expect(latestId).not.toBe(outlookId)
    const before = (await author.get(`/api/outlooks/${outlookId}`)).body.result
    const after = (await author.get(`/api/outlooks/${latestId}`)).body.result
    // Each listed figure is the two stored outlooks' own for that threshold and year.
    const kelwick = (await author.get(`/api/sites/${siteId}`)).body.thresholds as {
      id: string
      label: string
      kind: string
    }[]
    expect(view.staleness.changes.length).toBeGreaterThan(0)
    const chanceOf = (
      result: {
        years: number[]
        thresholds: { key: string, byYear: { value: number }[], flood: { annualChance: { value: number }[] } | null }[]
      },
      label: string,
      year: number,
    ) => {
      const threshold = result.thresholds.find(th => th.key === kelwick.find(k => k.label === label)!.id)!
      const t = result.years.indexOf(year)
      return threshold.flood ? threshold.flood.annualChance[t]!.value : threshold.byYear[t]!.value
    }
    for (const c of view.staleness.changes) {
      expect(c.scenario).toBe('SSP2-4.5')
      expect(c.was).toBe(chanceOf(before, c.threshold, c.year))
      expect(c.now).toBe(chanceOf(after, c.threshold, c.year))
    }
    // Quay Street (a mean-sea-level threshold) by 2050 moves with the glaciers.
    const change = view.staleness.changes.find(
      (c: { threshold: string, year: number }) =>
        c.threshold === 'High-tide flooding of Quay Street' && c.year === 2050,
    )
    expect(change).toMatchObject({ kind: 'mean-sea-level' })
    expect(formatChance(change.now, 'en')).not.toBe(formatChance(change.was, 'en'))

    // The shared page says the same, without ids of the site's records.
    const shared = (await new ApiClient(server.url).get(`/api/shared/${shareToken}`)).body
    expect(shared.staleness.changes).toContainEqual({
      scenario: 'SSP2-4.5',
      threshold: 'High-tide flooding of Quay Street',
      kind: 'mean-sea-level',
      year: 2050,
      was: change.was,
      now: change.now,
    })
    expect(JSON.stringify(shared.staleness)).not.toContain(thresholdIds[0])
    // Readers of the organisation see it too.
    expect(
      (await (await as(READER.email, READER.password)).get(`/api/briefings/${briefingId}`)).body.staleness.changes
        .length,
    ).toBeGreaterThan(0)
  })

  it('mails each of its planners exactly once, saying what changed', async () => {
    const first = await smtp.next(m => isTo(PLANNER.email)(m) && stale(m))
    await smtp.next(m => isTo(SECOND_PLANNER.email)(m) && stale(m))
    await outboxSettled()
    expect(smtp.to(PLANNER.email).filter(stale)).toHaveLength(1)
    expect(smtp.to(SECOND_PLANNER.email).filter(stale)).toHaveLength(1)
    // Nobody else of the organisation is mailed about it.
    expect(smtp.messages.filter(stale)).toHaveLength(2)
    const change = (await author.get(`/api/briefings/${briefingId}`)).body.staleness.changes.find(
      (c: { threshold: string, year: number }) =>
        c.threshold === 'High-tide flooding of Quay Street' && c.year === 2050,
    )
    expect(first.subject).toBe('Briefing out of date: Kelwick to 2100 (version 1, Kelwick)')
    expect(first.text).toContain(
      `SSP2-4.5, chance mean sea level is above "High-tide flooding of Quay Street" by 2050: ${formatChance(change.now, 'en')} now, ${formatChance(change.was, 'en')} in this briefing.`,
    )
    expect(first.text).toContain(`${server.url}/briefings/${briefingId}`)
  })

  it('makes a new draft version from the latest outlooks in one request', async () => {
    const draft = await author.post(`/api/briefings/${briefingId}/versions`, { fromLatestOutlooks: true })
    expect(draft.status).toBe(201)
    expect(draft.body).toMatchObject({
      state: 'draft',
      version: 2,
      previousId: briefingId,
      outlookIds: [latestId],
      thresholdIds,
      years: [2050, 2100],
      title: 'Kelwick to 2100',
    })
    const view = (await author.get(`/api/briefings/${draft.body.id}`)).body
    expect(view.staleness).toBeNull()
    // The issued version is untouched, and still says it is out of date.
    const issued = (await author.get(`/api/briefings/${briefingId}`)).body
    expect(issued.document).toEqual(frozen)
    expect(issued.state).toBe('issued')
    expect(issued.staleness).not.toBeNull()
  })

  it('refuses a malformed request, naming the field, and creates nothing', async () => {
    const count = async () => (await author.get('/api/briefings')).body.length
    const before = await count()
    const response = await author.post(`/api/briefings/${briefingId}/versions`, { fromLatestOutlooks: 'yes' })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/^fromLatestOutlooks: /)
    expect(
      (
        await (
          await as(READER.email, READER.password)
        ).post(`/api/briefings/${briefingId}/versions`, { fromLatestOutlooks: true })
      ).status,
    ).toBe(403)
    expect(await count()).toBe(before)
  })

  it('mails again once for a later change, and a watcher\'s update opens with the planning scenario\'s headline', async () => {
    expect((await author.post('/api/watches', { siteId, email: 'watcher@example.org' })).status).toBe(202)
    const confirmation = await smtp.next(m => isTo('watcher@example.org')(m) && /Confirm/.test(m.subject ?? ''))
    const token = new URL(linkIn(confirmation, `${server.url}/watches/confirm?token=`)).searchParams.get('token')!
    expect((await new ApiClient(server.url).post('/api/watches/confirm', { token })).status).toBe(200)

    await publishGlaciers(0.6)
    const update = await smtp.next(m => isTo('watcher@example.org')(m) && /has changed/.test(m.subject ?? ''))
    const outlooks = (await author.get(`/api/sites/${siteId}/outlooks`)).body.filter(
      (o: { scenario: string, seed: number, state: string }) =>
        o.scenario === 'SSP2-4.5' && o.seed === 11 && o.state === 'done',
    )
    const [now, was] = await Promise.all(
      [outlooks[0].id, outlooks[1].id].map(
        async id => (await author.get(`/api/outlooks/${id}`)).body.headline.probability,
      ),
    )
    expect(update.text).toContain(
      `Under SSP2-4.5, the planning scenario: the chance that mean sea level is above "High-tide flooding of Quay Street" (0.50 m) by 2100 is now ${formatChance(now, 'en')} (was ${formatChance(was, 'en')}).`,
    )
    await smtp.next(
      m =>
        isTo(SECOND_PLANNER.email)(m)
        && stale(m)
        && m.text!.includes(formatChance(now, 'en'))
        && smtp.to(SECOND_PLANNER.email).filter(stale).length === 2,
    )
    await outboxSettled()
    expect(smtp.to(PLANNER.email).filter(stale)).toHaveLength(2)
    expect(smtp.to(SECOND_PLANNER.email).filter(stale)).toHaveLength(2)
  })

  it('reads what was stored when the outlooks finished, without working it out again', async () => {
    const read = (await author.get(`/api/briefings/${briefingId}`)).body.staleness
    await server.stop()
    const db = new PGlite(serverEnv().PGLITE_DATA_DIR)
    const stored = await db.query<{ staleness: { changes: unknown[] } }>(
      'select staleness from briefings where id = $1',
      [briefingId],
    )
    expect({ changes: stored.rows[0]!.staleness.changes }).toEqual(read)
    // A figure no outlook gives: a read that worked staleness out from the outlooks could not say it.
    await db.query(
      `update briefings set staleness = jsonb_set(staleness, '{changes,0,was}', '0.123456') where id = $1`,
      [briefingId],
    )
    await db.close()
    server = await startServer(serverEnv())
    author = await as(PLANNER.email, PLANNER.password)
    expect((await author.get(`/api/briefings/${briefingId}`)).body.staleness.changes[0].was).toBe(0.123456)
    expect((await new ApiClient(server.url).get(`/api/shared/${shareToken}`)).body.staleness.changes[0].was).toBe(
      0.123456,
    )
  })

  it('works out once at start the staleness of a briefing issued before it was stored', async () => {
    const read = (await author.get(`/api/briefings/${briefingId}`)).body.staleness
    await server.stop()
    const db = new PGlite(serverEnv().PGLITE_DATA_DIR)
    // As a briefing issued before the column existed: nothing stored, never checked.
    await db.query('update briefings set staleness = null, staleness_checked_at = null where id = $1', [briefingId])
    await db.close()
    server = await startServer(serverEnv())
    author = await as(PLANNER.email, PLANNER.password)
    // Worked out in the background after start; the changes are the ones the outlooks give.
    await expect
      .poll(async () => (await author.get(`/api/briefings/${briefingId}`)).body.staleness?.changes.length ?? 0)
      .toBeGreaterThan(0)
    const again = (await author.get(`/api/briefings/${briefingId}`)).body.staleness
    expect(again.changes.map((c: { now: number }) => c.now)).toEqual(read.changes.map((c: { now: number }) => c.now))
  })
})
