import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { ParsedMail } from 'mailparser'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, demoUser } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { TestSmtp, isTo, linkIn, rawHeader } from '../support/smtp'
import { formatChance } from '../../shared/wording/chance'

const REVIEWER = demoUser('reviewer@saltglass.example')
let server: RunningServer
let smtp: TestSmtp
let planner: ApiClient
let shareToken: string
let siteId: string
let outlookId: string

const as = (email: string, password: string) => ApiClient.signedIn(server.url, email, password)

async function watch(email: string, language = 'en') {
  const response = await new ApiClient(server.url).post('/api/watches', { shareToken, email, language })
  expect(response.status).toBe(202)
  const mail = await smtp.next(m => isTo(email)(m) && /Confirm|Confirme/.test(m.subject ?? ''))
  return mail
}

async function confirm(mail: ParsedMail) {
  const token = new URL(linkIn(mail, `${server.url}/watches/confirm?token=`)).searchParams.get('token')!
  return new ApiClient(server.url).post('/api/watches/confirm', { token })
}

async function publishGlaciers(mean2100: number) {
  const analyst = await as(ANALYST.email, ANALYST.password)
  const reviewer = await as(REVIEWER.email, REVIEWER.password)
  const [current] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP2-4.5&state=published')).body
  const draft = await analyst.post('/api/releases', {
    seriesId: current.seriesId,
    form: 'normal',
    baselineYear: 2020,
    anchorYears: [2050, 2100, 2150],
    mean: [0.06, mean2100, mean2100 * 1.4],
    sd: [0.01, 0.03, 0.04],
    method: 'm',
    citation: `Glaciers revised (${mean2100})`,
    licence: 'l',
  })
  await analyst.post(`/api/releases/${draft.body.id}/submit`)
  await reviewer.post(`/api/releases/${draft.body.id}/approve`)
  return draft.body.id
}

beforeAll(async () => {
  smtp = await new TestSmtp().start()
  server = await startServer({ SMTP_URL: smtp.url, MAIL_POLL_MS: '200', MAIL_RETRY_BASE_MS: '200' })
  planner = await as(PLANNER.email, PLANNER.password)
  siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Fennmouth').id
  const thresholdIds = (await planner.get(`/api/sites/${siteId}`)).body.thresholds.map((t: { id: string }) => t.id)
  outlookId = (await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 4 }))
    .body.id
  const briefing = (
    await planner.post('/api/briefings', { outlookId, title: 'Fennmouth to 2100', thresholdIds, years: [2050, 2100] })
  ).body
  await planner.post(`/api/briefings/${briefing.id}/issue`)
  shareToken = (await planner.post(`/api/briefings/${briefing.id}/share`)).body.shareToken
})
afterAll(async () => {
  await server?.stop()
  await smtp?.stop()
})

describe('watching a site by e-mail', () => {
  it('confirms by e-mail (double opt-in), once, with an unsubscribe link and one-click headers', async () => {
    const mail = await watch('councillor@example.org')
    expect(mail.subject).toBe('Confirm that you want to watch Fennmouth')
    expect(rawHeader(mail, 'List-Unsubscribe')).toMatch(
      new RegExp(`^<${server.url}/api/watches/unsubscribe\\?token=[\\w-]+>$`),
    )
    expect(rawHeader(mail, 'List-Unsubscribe-Post')).toBe('List-Unsubscribe=One-Click')
    expect(mail.html).toContain('Confirm the watch')

    // Looking the link up names the site and the address and changes nothing: the watch still waits.
    const token = new URL(linkIn(mail, `${server.url}/watches/confirm?token=`)).searchParams.get('token')!
    const lookUp = () => new ApiClient(server.url).get(`/api/watches/confirm?token=${token}`)
    expect((await lookUp()).body).toEqual({ site: 'Fennmouth', email: 'councillor@example.org', stopped: false })
    expect((await lookUp()).status).toBe(200)

    const confirmed = await confirm(mail)
    expect(confirmed.status).toBe(200)
    expect(confirmed.body).toEqual({ site: 'Fennmouth', email: 'councillor@example.org' })
    const replay = await confirm(mail)
    expect(replay.status).toBe(404)
    expect(replay.body.message).toMatch(/already been used or is not valid/)
    expect((await lookUp()).status).toBe(404)
  })

  it('sends exactly one "what changed" e-mail per watcher, in their language, with the numbers before and after', async () => {
    await confirm(await watch('vecina@example.org', 'es'))
    const before = (await planner.get(`/api/outlooks/${outlookId}`)).body
    const releaseId = await publishGlaciers(0.16)

    const english = await smtp.next(m => isTo('councillor@example.org')(m) && /has changed/.test(m.subject ?? ''))
    const spanish = await smtp.next(m => isTo('vecina@example.org')(m) && /Cambió/.test(m.subject ?? ''))
    expect(english.subject).toBe('The sea-level outlook for Fennmouth has changed')
    expect(spanish.subject).toBe('Cambió la perspectiva del nivel del mar para Fennmouth')

    // The numbers are those of the stored outlooks before and after the new release.
    const outlooks = (await planner.get(`/api/sites/${siteId}/outlooks`)).body.filter(
      (o: { scenario: string, seed: number }) => o.scenario === 'SSP2-4.5' && o.seed === 4,
    )
    const after = (await planner.get(`/api/outlooks/${outlooks[0].id}`)).body
    expect(after.releaseRefs.find((r: { component: string }) => r.component === 'glaciers').releaseId).toBe(releaseId)
    const year = after.result.years.indexOf(2100)
    // The railway embankment is a flood level: its number is the chance the water reaches it in that year.
    const chance = (o: { result: { thresholds: { flood: { annualChance: { value: number }[] } }[] } }) =>
      formatChance(o.result.thresholds[1]!.flood.annualChance[year]!.value, 'en')
    expect(english.text).toContain(
      `Railway embankment (1.90 m, flood level: chance the water reaches it that year, SSP2-4.5)  |  2100  |  ${chance(before)}  |  ${chance(after)}`,
    )
    expect(english.text).toMatch(/Glaciers \(SSP2-4\.5\) {2}\| {2}v1 {2}\| {2}v2 {2}\| {2}Glaciers revised \(0\.16\)/)
    expect(english.text).toMatch(new RegExp(`Read the latest briefing: ${server.url}/shared/${shareToken}`))
    expect(spanish.text).toContain('La probabilidad para cada umbral')

    await expect
      .poll(
        async () =>
          (await (await as(OPERATOR.email, OPERATOR.password)).get('/api/admin/outbox')).body.messages.filter(
            (m: { state: string }) => m.state === 'queued',
          ).length,
      )
      .toBe(0)
    expect(smtp.to('councillor@example.org').filter(m => /has changed/.test(m.subject ?? ''))).toHaveLength(1)
    expect(smtp.to('vecina@example.org').filter(m => /Cambió/.test(m.subject ?? ''))).toHaveLength(1)
  })

  it('stops at once after the one-click unsubscribe', async () => {
    const last = smtp.to('councillor@example.org').at(-1)!
    const link = rawHeader(last, 'List-Unsubscribe')!.slice(1, -1)
    // Opening the link (GET, as mail scanners do) only describes it.
    const described = async () => (await fetch(link)).json()
    expect(await described()).toEqual({ site: 'Fennmouth', email: 'councillor@example.org', stopped: false })
    expect(await described()).toEqual({ site: 'Fennmouth', email: 'councillor@example.org', stopped: false })
    const response = await fetch(link, {
      method: 'POST',
      body: 'List-Unsubscribe=One-Click',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
    })
    expect(response.status).toBe(200)
    expect(await described()).toEqual({ site: 'Fennmouth', email: 'councillor@example.org', stopped: true })

    await publishGlaciers(0.17)
    await smtp.next(m => isTo('vecina@example.org')(m) && /Cambió/.test(m.subject ?? '') && /0\.17/.test(m.text ?? ''))
    await expect
      .poll(
        async () =>
          (await (await as(OPERATOR.email, OPERATOR.password)).get('/api/admin/outbox')).body.messages.filter(
            (m: { state: string }) => m.state === 'queued',
          ).length,
      )
      .toBe(0)
    expect(smtp.to('councillor@example.org').filter(m => /has changed/.test(m.subject ?? ''))).toHaveLength(1)
  })

  it.each([
    ['a malformed address', { email: 'not-an-address' }, 400, /^email: Enter a valid e-mail address/],
    ['an unknown share link', { shareToken: 'x'.repeat(32) }, 404, /does not open a briefing/],
    [
      'a site id without signing in',
      { siteId: '00000000-0000-4000-8000-000000000000', shareToken: undefined },
      401,
      /Sign in to watch a site/,
    ],
  ])('refuses %s with a clear message and sends nothing', async (_name, overrides, status, message) => {
    const sent = smtp.messages.length
    const response = await new ApiClient(server.url).post('/api/watches', {
      shareToken,
      email: 'someone@example.org',
      ...overrides,
    })
    expect(response.status).toBe(status)
    expect(response.body.message).toMatch(message)
    expect(smtp.messages.length).toBe(sent)
  })

  it('refuses malformed confirmation and unsubscribe tokens', async () => {
    expect((await new ApiClient(server.url).post('/api/watches/confirm', { token: 'short' })).status).toBe(400)
    expect((await new ApiClient(server.url).post('/api/watches/confirm', { token: 'y'.repeat(32) })).status).toBe(404)
    expect((await new ApiClient(server.url).post(`/api/watches/unsubscribe?token=${'z'.repeat(32)}`)).status).toBe(404)
  })

  it('limits watch requests per address', async () => {
    const statuses: number[] = []
    for (let i = 0; i < 6; i++)
      statuses.push(
        (await new ApiClient(server.url).post('/api/watches', { shareToken, email: 'eager@example.org' })).status,
      )
    expect(statuses).toEqual([202, 202, 202, 202, 202, 429])
  })
})

describe('a watch made from a shared briefing\'s link', () => {
  async function shareBriefing(body: Record<string, unknown>) {
    const briefing = (await planner.post('/api/briefings', body)).body
    expect((await planner.post(`/api/briefings/${briefing.id}/issue`)).status).toBe(200)
    return {
      id: briefing.id as string,
      token: (await planner.post(`/api/briefings/${briefing.id}/share`)).body.shareToken as string,
    }
  }
  async function watchThrough(token: string, email: string) {
    expect((await new ApiClient(server.url).post('/api/watches', { shareToken: token, email })).status).toBe(202)
    const mail = await smtp.next(m => isTo(email)(m) && /Confirm/.test(m.subject ?? ''))
    expect((await confirm(mail)).status).toBe(200)
  }
  const queuedMail = async () =>
    (await (await as(OPERATOR.email, OPERATOR.password)).get('/api/admin/outbox')).body.messages.filter(
      (m: { state: string }) => m.state === 'queued',
    ).length

  it('is told only what that briefing showed, and stops with one e-mail when the link is revoked', async () => {
    const [gateSill] = (await planner.get(`/api/sites/${siteId}`)).body.thresholds as { id: string, label: string }[]
    expect(gateSill!.label).toBe('Flood gate sill')
    // One briefing shows SSP2-4.5, the flood gate sill only, in 2050 only; another shows SSP5-8.5 only.
    const narrow = await shareBriefing({
      outlookId,
      title: 'Fennmouth gate sill by 2050',
      thresholdIds: [gateSill!.id],
      years: [2050],
    })
    const highOutlook = (
      await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP5-8.5', samples: 20_000, seed: 4 })
    ).body.id
    const high = await shareBriefing({
      outlookId: highOutlook,
      title: 'Fennmouth under SSP5-8.5',
      thresholdIds: [gateSill!.id],
      years: [2100],
    })
    await watchThrough(narrow.token, 'narrow@example.org')
    await watchThrough(high.token, 'other-scenario@example.org')

    await publishGlaciers(0.18)
    // The site's own watcher hears of everything; the link's watcher of what its briefing showed.
    await smtp.next(m => isTo('vecina@example.org')(m) && /0\.18/.test(m.text ?? ''))
    const narrowMail = await smtp.next(m => isTo('narrow@example.org')(m) && /has changed/.test(m.subject ?? ''))
    expect(narrowMail.text).toContain('Flood gate sill (')
    expect(narrowMail.text).not.toContain('Railway embankment')
    expect(narrowMail.text).toMatch(/ {2}\| {2}2050 {2}\| {2}/)
    expect(narrowMail.text).not.toMatch(/ {2}\| {2}2100 {2}\| {2}/)
    expect(narrowMail.text).not.toContain('SSP5-8.5')
    expect(narrowMail.text).toContain(`Read the latest briefing: ${server.url}/shared/${narrow.token}`)
    await expect.poll(queuedMail).toBe(0)
    // Nothing its briefing showed changed (another scenario), so nothing was sent.
    expect(smtp.to('other-scenario@example.org').filter(m => /has changed/.test(m.subject ?? ''))).toHaveLength(0)

    // Revoking the link ends the watch, with one e-mail saying so.
    expect((await planner.request('DELETE', `/api/briefings/${narrow.id}/share`)).status).toBe(200)
    const ended = await smtp.next(m => isTo('narrow@example.org')(m) && /no longer hear/.test(m.subject ?? ''))
    expect(ended.subject).toBe('You will no longer hear about Fennmouth')
    expect(ended.text).toContain('Its authors have withdrawn that link, so the watch has ended')
    await publishGlaciers(0.19)
    await smtp.next(m => isTo('vecina@example.org')(m) && /0\.19/.test(m.text ?? ''))
    await expect.poll(queuedMail).toBe(0)
    expect(smtp.to('narrow@example.org').filter(m => /has changed/.test(m.subject ?? ''))).toHaveLength(1)
    expect(smtp.to('narrow@example.org').filter(m => /no longer hear/.test(m.subject ?? ''))).toHaveLength(1)
    // Revoking again, or sharing anew, does not mail it again or bring it back.
    await planner.post(`/api/briefings/${narrow.id}/share`)
    await planner.request('DELETE', `/api/briefings/${narrow.id}/share`)
    await expect.poll(queuedMail).toBe(0)
    expect(smtp.to('narrow@example.org').filter(m => /no longer hear/.test(m.subject ?? ''))).toHaveLength(1)
  })
})

describe('an address the mail server refuses for good', () => {
  it('fails at once (no retries for hours), leaves health ok, and its watch sends nothing more', async () => {
    smtp.refuse('nobody-here@example.org')
    expect(
      (await new ApiClient(server.url).post('/api/watches', { shareToken, email: 'nobody-here@example.org' })).status,
    ).toBe(202)
    const operator = await as(OPERATOR.email, OPERATOR.password)
    const message = async () =>
      (await operator.get('/api/admin/outbox')).body.messages.find(
        (m: { to: string }) => m.to === 'nobody-here@example.org',
      )
    await expect.poll(async () => (await message())?.state, { timeout: 20_000 }).toBe('failed')
    expect(await message()).toMatchObject({
      attempts: 1,
      lastError: expect.stringMatching(/^The mail server refused this address for good: .*550/),
    })
    expect(smtp.triesOf('nobody-here@example.org')).toBe(1)
    const health = (await new ApiClient(server.url).get('/api/health')).body
    expect(health.status).toBe('ok')
    expect(health.mail.failing).toBe(0)
  })
})

describe('a mail server that is down loses nothing', () => {
  let faulty: RunningServer
  let outage: TestSmtp

  beforeAll(async () => {
    outage = await new TestSmtp().start()
    faulty = await startServer({
      SMTP_URL: outage.url,
      MAIL_POLL_MS: '100',
      MAIL_RETRY_BASE_MS: '100',
      WATCH_CONFIRM_HOURS: '0',
    })
  })
  afterAll(async () => {
    await faulty?.stop()
    await outage?.stop()
  })

  it('queues with the error recorded while the server is down, then delivers each message exactly once', async () => {
    const port = outage.port
    await outage.stop()
    const api = new ApiClient(faulty.url)
    await api.signIn(PLANNER.email, PLANNER.password)
    const site = (await api.get('/api/sites'))
    const kelwick = site.body.find((s: { name: string }) => s.name === 'Kelwick').id
    for (const email of ['a@example.org', 'b@example.org', 'c@example.org']) {
      expect((await api.post('/api/watches', { siteId: kelwick, email })).status).toBe(202)
    }
    const admin = new ApiClient(faulty.url)
    await admin.signIn(OPERATOR.email, OPERATOR.password)
    await expect
      .poll(async () =>
        (await admin.get('/api/admin/outbox')).body.messages.every(
          (m: { attempts: number, lastError: string | null, state: string }) =>
            m.state === 'queued' && m.attempts >= 1 && m.lastError,
        ),
      )
      .toBe(true)

    await outage.start(port)
    await Promise.all(['a@example.org', 'b@example.org', 'c@example.org'].map(address => outage.next(isTo(address))))
    await expect
      .poll(async () => (await admin.get('/api/admin/outbox')).body.messages.map((m: { state: string }) => m.state))
      .toEqual(['sent', 'sent', 'sent'])
    for (const address of ['a@example.org', 'b@example.org', 'c@example.org'])
      expect(outage.to(address)).toHaveLength(1)
  })

  it('refuses an expired confirmation link with 410', async () => {
    const mail = await outage.next(isTo('a@example.org'))
    const token = new URL(linkIn(mail, `${faulty.url}/watches/confirm?token=`)).searchParams.get('token')!
    const response = await new ApiClient(faulty.url).post('/api/watches/confirm', { token })
    expect(response.status).toBe(410)
    expect(response.body.message).toMatch(/expired/)
    expect((await new ApiClient(faulty.url).get(`/api/watches/confirm?token=${token}`)).status).toBe(410)
  })
})
