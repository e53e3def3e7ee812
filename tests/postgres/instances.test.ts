import pg from 'pg'
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest'
import { ApiClient } from '../support/client'
import { createTestDatabase, type TestDatabase } from '../support/database'
import { ADMIN, ANALYST, OPERATOR, PLANNER, READER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { TestSmtp, addressesOf } from '../support/smtp'

// Two app instances on one PostgreSQL database, sending to one SMTP server: every job, outlook
// and e-mail is taken by exactly one of them, concurrent changes to one record serialise, and rate
// limits count across both.
// The test reads the database directly to see who did what.

const REVIEWER = demoUser('reviewer@saltglass.example')
const FAST = { JOBS_POLL_MS: '100', MAIL_POLL_MS: '100', MAIL_RETRY_BASE_MS: '100' }
const SITES = 4
const WATCHER = (i: number) => `watcher${i}@caldwyn.example`

let database: TestDatabase
let sql: pg.Client
let smtp: TestSmtp
let a: RunningServer
let b: RunningServer

beforeAll(async () => {
  database = await createTestDatabase()
  smtp = await new TestSmtp().start()
  const env = { DATABASE_URL: database.url, SMTP_URL: smtp.url, ...FAST }
  // Started side by side: migrating and seeding must happen once.
  ;[a, b] = await Promise.all([startServer(env), startServer(env)])
  sql = new pg.Client({ connectionString: database.url })
  await sql.connect()
})

afterAll(async () => {
  await sql?.end()
  await Promise.all([a?.stop(), b?.stop()])
  await smtp?.stop()
  await database?.drop()
})

describe('two instances on one database', () => {
  it('seeded the demo once although both started together', async () => {
    const { rows } = await sql.query('select count(*)::int as n from users where email = $1', [ADMIN.email])
    expect(rows[0].n).toBe(1)
  })

  it('shares a recomputation after a publication: each outlook computed once, each e-mail sent once', async () => {
    const plannerA = await ApiClient.signedIn(a.url, PLANNER.email, PLANNER.password)
    const plannerB = await ApiClient.signedIn(b.url, PLANNER.email, PLANNER.password)
    const sites = ((await plannerA.get('/api/sites')).body as Array<{ id: string }>).slice(0, SITES)
    for (const [i, site] of sites.entries()) {
      const planner = i % 2 ? plannerB : plannerA
      expect(
        (await planner.post(`/api/sites/${site.id}/outlooks`, { scenario: 'SSP5-8.5', samples: 50_000, seed: 21 }))
          .status,
      ).toBe(201)
      expect(
        (await planner.post('/api/watches', { siteId: site.id, email: WATCHER(i), language: 'en' })).status,
      ).toBeLessThan(300)
      const confirm = await smtp.next(mail => addressesOf(mail).includes(WATCHER(i)))
      // Either instance may have sent it, so the link names either one's address.
      const token = /\/watches\/confirm\?token=([\w-]+)/.exec(confirm.text ?? '')?.[1]
      expect((await plannerB.post('/api/watches/confirm', { token })).status).toBe(200)
    }

    // Published through instance B, reviewed through instance A.
    const analyst = await ApiClient.signedIn(b.url, ANALYST.email, ANALYST.password)
    const reviewer = await ApiClient.signedIn(a.url, REVIEWER.email, REVIEWER.password)
    const [antarctica] = (await analyst.get('/api/releases?component=antarctica&scenario=SSP5-8.5&state=published'))
      .body
    const next = await analyst.post('/api/releases', {
      seriesId: antarctica.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.05, 0.2, 0.45],
      sd: [0.02, 0.1, 0.25],
      method: 'm',
      citation: 'c',
      licence: 'l',
    })
    expect((await analyst.post(`/api/releases/${next.body.id}/submit`)).status).toBe(200)
    expect((await reviewer.post(`/api/releases/${next.body.id}/approve`)).status).toBe(200)

    const admin = await ApiClient.signedIn(b.url, OPERATOR.email, OPERATOR.password)
    const batch = await vi.waitFor(async () => {
      const row = (await admin.get('/api/admin/recomputations')).body.recomputations.find(
        (r: { scenario: string }) => r.scenario === 'SSP5-8.5',
      )
      if (!row?.finishedAt) throw new Error('recomputation not finished')
      return row
    }, { timeout: 60_000, interval: 200 })
    expect(batch).toMatchObject({ siteCount: SITES, done: SITES, failed: 0 })

    // Each site: the old outlook and exactly one new one, computed in one attempt.
    const outlooks = await sql.query(
      `select site_id, attempts, state from outlooks where scenario = 'SSP5-8.5' and seed = 21`,
    )
    expect(outlooks.rows).toHaveLength(2 * SITES)
    expect(outlooks.rows.every(row => row.state === 'done' && row.attempts === 1)).toBe(true)
    const jobs = await sql.query(`select kind, state from jobs`)
    expect(jobs.rows.filter(row => row.state !== 'done')).toEqual([])

    // Every message is delivered once the outbox has drained, and no watcher hears twice.
    await vi.waitFor(async () => {
      const { rows } = await sql.query(`select count(*)::int as n from mail_outbox where state <> 'sent'`)
      if (rows[0].n) throw new Error('outbox not drained')
    }, { timeout: 30_000, interval: 100 })
    for (let i = 0; i < SITES; i++) {
      const changed = smtp.to(WATCHER(i)).filter(mail => /has changed/.test(mail.subject ?? ''))
      expect(changed).toHaveLength(1)
    }
    const sent = await sql.query(`select count(*)::int as n from mail_outbox`)
    expect(smtp.messages).toHaveLength(sent.rows[0].n)
  })

  it('lets only one of two simultaneous approvals of a release through', async () => {
    const analyst = await ApiClient.signedIn(a.url, ANALYST.email, ANALYST.password)
    const [glaciers] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP1-2.6&state=published')).body
    const next = await analyst.post('/api/releases', {
      seriesId: glaciers.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.05, 0.09, 0.12],
      sd: [0.01, 0.02, 0.03],
      method: 'm',
      citation: 'c',
      licence: 'l',
    })
    await analyst.post(`/api/releases/${next.body.id}/submit`)
    const [viaA, viaB] = await Promise.all([
      ApiClient.signedIn(a.url, REVIEWER.email, REVIEWER.password),
      ApiClient.signedIn(b.url, REVIEWER.email, REVIEWER.password),
    ])
    const answers = await Promise.all([
      viaA.post(`/api/releases/${next.body.id}/approve`),
      viaB.post(`/api/releases/${next.body.id}/approve`),
    ])
    expect(answers.map(r => r.status).sort()).toEqual([200, 409])
    const { rows } = await sql.query(
      `select count(*)::int as n from audit_log where action = 'release.published' and target_id = $1`,
      [next.body.id],
    )
    expect(rows[0].n).toBe(1)
  })

  it('keeps one unpublished version per series, even past two checks made at the same moment', async () => {
    const analyst = await ApiClient.signedIn(a.url, ANALYST.email, ANALYST.password)
    const [land] = (await analyst.get('/api/releases?component=land-water&scenario=SSP5-8.5&state=published')).body
    const draft = await analyst.post('/api/releases', {
      seriesId: land.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.01, 0.02, 0.03],
      sd: [0.005, 0.01, 0.015],
      method: 'm',
      citation: 'c',
      licence: 'l',
    })
    expect(draft.status).toBe(201)
    // What a second request does when it checked for an open version before the first committed and
    // read the highest version after: a draft of the next version. The database refuses it.
    const columns
      = 'series_id, organisation_id, form, baseline_year, anchor_years, parameters, entered_unit, summary, method, citation, licence, author_id'
    const copy = sql.query(
      `insert into releases (version, state, ${columns}) select version + 1, 'draft', ${columns} from releases where id = $1`,
      [draft.body.id],
    )
    await expect(copy).rejects.toMatchObject({ code: '23505', constraint: 'releases_one_unpublished' })
  })

  it('counts failed sign-ins on both instances against one lock', async () => {
    const attempt = (server: RunningServer, password: string) =>
      new ApiClient(server.url).post('/api/auth/sign-in', { email: READER.email, password })
    // Ten failures, alternating between the instances: each saw five, the lock is for ten.
    for (let i = 0; i < 10; i++) expect((await attempt(i % 2 ? b : a, `wrong-${i}`)).status).toBe(401)
    for (const server of [a, b]) {
      const locked = await attempt(server, READER.password)
      expect(locked.status).toBe(429)
      expect(locked.body.message).toMatch(
        /^Too many failed sign-ins for this address, so it is locked for now\. Try again in 15 minutes\.$/,
      )
    }
  })
})
