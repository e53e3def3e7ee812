import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { TestSmtp, isTo, linkIn } from '../support/smtp'

// The server trusts X-Forwarded-For here, so each test can play a client of its own and the
// per-client limits of one test do not spill into the next.
let server: RunningServer
let smtp: TestSmtp
let admin: ApiClient
let clients = 0
const newClientAddress = () => `203.0.113.${++clients}`

function from(address: string, extra: Record<string, string> = {}) {
  const api = new ApiClient(server.url)
  const request = api.request.bind(api)
  api.request = (method, path, body, init = {}) =>
    request(method, path, body, { ...init, headers: { 'x-forwarded-for': address, ...extra, ...init.headers } })
  return api
}

const signInAttempt = (api: ApiClient, email: string, password: string) =>
  api.post('/api/auth/sign-in', { email, password })
const auditLines = async () =>
  (await admin.get('/api/admin/audit?limit=500')).body as {
    action: string
    targetId: string | null
    detail: Record<string, unknown>
  }[]

beforeAll(async () => {
  smtp = await new TestSmtp().start()
  server = await startServer({ TRUST_PROXY: 'true', SMTP_URL: smtp.url, MAIL_POLL_MS: '200' })
  admin = from(newClientAddress())
  // The operator: failed sign-ins for unknown addresses belong to no organisation, so only they see them.
  await admin.signIn(OPERATOR.email, OPERATOR.password)
})
afterAll(async () => {
  await server?.stop()
  await smtp?.stop()
})

describe('cross-site request forgery', () => {
  it('refuses a state-changing request from another site, with a message saying why', async () => {
    const planner = from(newClientAddress())
    await planner.signIn(PLANNER.email, PLANNER.password)
    const forgeries: Record<string, string>[] = [
      { origin: 'https://elsewhere.example' },
      { 'sec-fetch-site': 'cross-site' },
      { 'sec-fetch-site': 'same-site' },
      { origin: 'null' },
    ]
    for (const headers of forgeries) {
      const forged = await planner.request('PATCH', '/api/me', { locale: 'es' }, { headers })
      expect(forged.status, JSON.stringify(headers)).toBe(403)
      expect(forged.body.message).toBe(
        'This request came from another site, so it was refused. Open Brinkwater itself and try again there.',
      )
    }
    const signOut = await planner.request('DELETE', '/api/_auth/session', undefined, {
      headers: { origin: 'https://elsewhere.example' },
    })
    expect(signOut.status).toBe(403)
    expect((await planner.get('/api/me')).body.user.locale).toBe('en')
  })

  it('lets the app itself, and clients that are not browsers, change things', async () => {
    const planner = from(newClientAddress())
    await planner.signIn(PLANNER.email, PLANNER.password)
    const sameOrigin = await planner.request(
      'PATCH',
      '/api/me',
      { locale: 'es' },
      { headers: { 'origin': server.url, 'sec-fetch-site': 'same-origin' } },
    )
    expect(sameOrigin.status).toBe(200)
    const originOnly = await planner.request('PATCH', '/api/me', { locale: 'en' }, { headers: { origin: server.url } })
    expect(originOnly.status).toBe(200)
    const noOrigin = await planner.request('PATCH', '/api/me', { locale: 'en' })
    expect(noOrigin.status).toBe(200)
    // Reading is not state-changing: a cross-site GET is answered (the browser keeps the answer from the other site).
    expect(
      (await planner.request('GET', '/api/me', undefined, { headers: { 'sec-fetch-site': 'cross-site' } })).status,
    ).toBe(200)
  })
})

describe('sign-in limits', () => {
  it('locks an address after ten failures with 429, Retry-After and when to try again; other addresses still sign in', async () => {
    const attacker = from(newClientAddress())
    for (let i = 0; i < 10; i++)
      expect((await signInAttempt(attacker, ANALYST.email, `wrong-password-${i}`)).status).toBe(401)

    const locked = await signInAttempt(attacker, ANALYST.email, ANALYST.password)
    expect(locked.status).toBe(429)
    expect(locked.body.message).toBe(
      'Too many failed sign-ins for this address, so it is locked for now. Try again in 15 minutes.',
    )
    expect(Number(locked.headers.get('retry-after'))).toBeGreaterThan(14 * 60)
    expect(Number(locked.headers.get('retry-after'))).toBeLessThanOrEqual(15 * 60)
    // The lock holds for the right password from anywhere, since guesses can come from many places.
    expect((await signInAttempt(from(newClientAddress()), ANALYST.email, ANALYST.password)).status).toBe(429)

    // Someone else, even on the same connection, is not affected.
    expect((await signInAttempt(attacker, PLANNER.email, PLANNER.password)).status).toBe(200)

    const lines = await auditLines()
    expect(
      lines.filter(line => line.action === 'session.sign-in-failed' && line.detail.email === ANALYST.email),
    ).toHaveLength(10)
    expect(
      lines.some(
        line =>
          line.action === 'session.locked-out'
          && line.detail.email === ANALYST.email
          && line.detail.scope === 'address',
      ),
    ).toBe(true)
  })

  it('slows a client that fails on many addresses to one attempt every few seconds, and lets a correct password from it in', async () => {
    const sprayer = from(newClientAddress())
    for (let i = 0; i < 50; i++)
      expect((await signInAttempt(sprayer, `guess-${i}@caldwyn.example`, 'summer-harbour-2026')).status).toBe(401)
    // Someone else in the same office, with the right password, is not locked out.
    expect((await signInAttempt(sprayer, PLANNER.email, PLANNER.password)).status).toBe(200)
    // A guess straight after is slowed: a few seconds, not a quarter of an hour.
    await signInAttempt(sprayer, 'guess-51@caldwyn.example', 'summer-harbour-2026')
    const slowed = await signInAttempt(sprayer, 'guess-52@caldwyn.example', 'summer-harbour-2026')
    expect(slowed.status).toBe(429)
    expect(slowed.body.message).toMatch(
      /^Too many failed sign-ins from this connection, so it may try once every 5 seconds for now\. Try again in [1-5] seconds?\.$/,
    )
    expect(Number(slowed.headers.get('retry-after'))).toBeLessThanOrEqual(5)
    // Those addresses are not locked for others.
    expect((await signInAttempt(from(newClientAddress()), 'guess-1@caldwyn.example', 'anything-else')).status).toBe(401)
    expect((await signInAttempt(from(newClientAddress()), PLANNER.email, PLANNER.password)).status).toBe(200)
    expect(
      (await auditLines()).some(line => line.action === 'session.locked-out' && line.detail.scope === 'client'),
    ).toBe(true)
  })

  it('counts concurrent guesses at one account atomically: exactly ten are checked, the rest refused', async () => {
    const guesses = Array.from({ length: 30 }, (_, i) =>
      signInAttempt(from(newClientAddress()), PORT_PLANNER.email, `concurrent-guess-${i}`),
    )
    const statuses = (await Promise.all(guesses)).map(answer => answer.status)
    expect(statuses.filter(status => status === 401)).toHaveLength(10)
    expect(statuses.filter(status => status === 429)).toHaveLength(20)
    // The account stays locked for the right password too, from anywhere.
    expect((await signInAttempt(from(newClientAddress()), PORT_PLANNER.email, PORT_PLANNER.password)).status).toBe(429)
    const lines = await auditLines()
    expect(
      lines.filter(line => line.action === 'session.sign-in-failed' && line.detail.email === PORT_PLANNER.email),
    ).toHaveLength(10)
  })

  it('counts concurrent guesses from one client atomically: at most fifty fail before it is slowed', async () => {
    const sprayer = from(newClientAddress())
    const started = Date.now()
    const guesses = Array.from({ length: 70 }, (_, i) =>
      signInAttempt(sprayer, `spray-${i}@caldwyn.example`, 'summer-harbour-2026'),
    )
    const statuses = (await Promise.all(guesses)).map(answer => answer.status)
    // Fifty failures, then one guess per five-second window of the slowed client while the burst lasted.
    const windows = Math.ceil((Date.now() - started) / 5000)
    const failed = statuses.filter(status => status === 401).length
    expect(failed).toBeGreaterThanOrEqual(51)
    expect(failed).toBeLessThanOrEqual(50 + windows)
    expect(statuses.filter(status => status !== 401).every(status => status === 429)).toBe(true)
  })

  it('a successful sign-in clears the count for its address', async () => {
    const person = from(newClientAddress())
    for (let i = 0; i < 9; i++) await signInAttempt(person, PLANNER.email, `typo-${i}`)
    expect((await signInAttempt(person, PLANNER.email, PLANNER.password)).status).toBe(200)
    for (let i = 0; i < 9; i++) expect((await signInAttempt(person, PLANNER.email, `typo-again-${i}`)).status).toBe(401)
    expect((await signInAttempt(person, PLANNER.email, PLANNER.password)).status).toBe(200)
  })
})

describe('public write endpoints are limited per client', () => {
  it.each([
    [
      'password reset requests',
      '/api/account/password-reset',
      (i: number) => ({ email: `someone-${i}@example.org` }),
      20,
    ],
    [
      'invitation accepts',
      '/api/account/invitation/accept',
      () => ({ token: 'x'.repeat(32), password: 'kelp rope harbour lantern' }),
      20,
    ],
    ['watch confirmations', '/api/watches/confirm', () => ({ token: 'x'.repeat(32) }), 60],
  ])('%s: 429 with Retry-After after the limit', async (_name, path, body, limit) => {
    const client = from(newClientAddress())
    for (let i = 0; i < limit; i++) expect((await client.post(path, body(i))).status).not.toBe(429)
    const refused = await client.post(path, body(limit))
    expect(refused.status).toBe(429)
    expect(refused.body.message).toMatch(/^Too many .+ Try again in \d+ minutes?\.$/)
    expect(refused.headers.get('retry-after')).toMatch(/^\d+$/)
    expect((await from(newClientAddress()).post(path, body(0))).status).not.toBe(429)
  })

  it('unsubscribe links: 429 after sixty from one client', async () => {
    const client = from(newClientAddress())
    for (let i = 0; i < 60; i++)
      expect((await client.post(`/api/watches/unsubscribe?token=${'y'.repeat(32)}`)).status).not.toBe(429)
    expect((await client.post(`/api/watches/unsubscribe?token=${'y'.repeat(32)}`)).status).toBe(429)
  })
})

describe('password policy', () => {
  let organisationId: string
  beforeAll(async () => { organisationId = (await admin.get('/api/organisations')).body[0].id })
  const create = (email: string, password: string) =>
    admin.post('/api/admin/users', { email, name: 'Policy Test', role: 'reader', organisationId, password })

  it.each([
    [
      'a very common password',
      'policy-a@caldwyn.example',
      'Password1234',
      'This password is on a list of very common passwords. Choose one that is harder to guess, such as three or four unrelated words.',
    ],
    [
      'the address before the @',
      'tidewatcher@caldwyn.example',
      'my-TideWatcher-2026',
      'Do not use your e-mail address (or its part before the @) in your password.',
    ],
    ['more than 256 characters', 'policy-b@caldwyn.example', 'k'.repeat(257), 'Use at most 256 characters.'],
  ])('refuses %s, naming the rule', async (_rule, email, password, message) => {
    const refused = await create(email, password)
    expect(refused.status).toBe(400)
    expect(refused.body.data.issues).toEqual([{ field: 'password', message }])
    expect((await admin.get('/api/admin/users')).body.some((user: { email: string }) => user.email === email)).toBe(
      false,
    )
  })

  it('accepts a long passphrase', async () => {
    expect((await create('policy-c@caldwyn.example', 'kelp rope harbour lantern')).status).toBe(201)
  })

  it('checks an invitation password against the invited address, and the invitation stays usable', async () => {
    const sent = await admin.post('/api/admin/invitations', {
      email: 'saltmarsh@caldwyn.example',
      name: 'Sal Marsh',
      role: 'reader',
      organisationId,
    })
    expect(sent.status).toBe(202)
    const mail = await smtp.next(isTo('saltmarsh@caldwyn.example'))
    const token = new URL(linkIn(mail, `${server.url}/account/invitation?token=`)).searchParams.get('token')!
    const invitee = from(newClientAddress())
    const refused = await invitee.post('/api/account/invitation/accept', { token, password: 'saltmarsh-forever' })
    expect(refused.status).toBe(400)
    expect(refused.body.message).toBe(
      'password: Do not use your e-mail address (or its part before the @) in your password.',
    )
    expect(
      (await invitee.post('/api/account/invitation/accept', { token, password: 'kelp rope harbour lantern' })).status,
    ).toBe(201)
  })
})

describe('the audit log', () => {
  it('records privileged actions for admins, and refuses everyone else', async () => {
    const users = (await admin.get('/api/admin/users')).body as { id: string, email: string }[]
    const reader = users.find(user => user.email === READER.email)!
    expect((await admin.patch(`/api/admin/users/${reader.id}`, { name: 'Renamed Reader' })).status).toBe(200)
    const line = (await auditLines()).find(entry => entry.action === 'user.updated' && entry.targetId === reader.id)
    expect(line?.detail).toMatchObject({ after: { name: 'Renamed Reader' } })

    for (const demo of [PLANNER, READER]) {
      const api = from(newClientAddress())
      await api.signIn(demo.email, demo.password)
      const refused = await api.get('/api/admin/audit')
      expect(refused.status).toBe(403)
      expect(refused.body.message).toMatch(/admin role/)
    }
    expect((await from(newClientAddress()).get('/api/admin/audit')).status).toBe(401)
  })
})
