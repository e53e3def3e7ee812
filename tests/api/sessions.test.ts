import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { OPERATOR, PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { TestSmtp, isTo, linkIn } from '../support/smtp'

// A session ends on the server: a copy of its cookie (another device, or a thief's) stops working
// when its owner signs out, changes or resets the password, or is disabled, and enabling them again
// does not bring it back. Each person here has two cookie jars: the one they use and a copy.

let server: RunningServer
let smtp: TestSmtp

beforeAll(async () => {
  smtp = await new TestSmtp().start()
  server = await startServer({ SMTP_URL: smtp.url, MAIL_POLL_MS: '200' })
})
afterAll(async () => {
  await server?.stop()
  await smtp?.stop()
})

/** This client's cookie as it is now, sent as it is by whoever copied it (it ignores Set-Cookie). */
function copyOf(api: ApiClient) {
  const cookie = api.cookieHeader()
  return async (method: string, path: string) => {
    const response = await fetch(server.url + path, { method, headers: { cookie, accept: 'application/json' } })
    return { status: response.status, body: await response.json() as Record<string, any> }
  }
}

const used = new Set<unknown>()
async function resetLink(email: string) {
  expect((await new ApiClient(server.url).post('/api/account/password-reset', { email })).status).toBe(202)
  const mail = await smtp.next(m => isTo(email)(m) && !used.has(m))
  used.add(mail)
  return new URL(linkIn(mail, `${server.url}/account/reset?token=`)).searchParams.get('token')!
}

describe('ending sessions', () => {
  it('signing out ends the copied cookie too, and the session view shows nobody signed in', async () => {
    const planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
    const stolen = copyOf(planner)
    expect((await stolen('GET', '/api/me')).status).toBe(200)

    expect((await planner.request('DELETE', '/api/_auth/session')).status).toBe(200)
    const refused = await stolen('GET', '/api/me')
    expect(refused.status).toBe(401)
    expect(refused.body.message).toMatch(/session has ended/)
    expect((await stolen('GET', '/api/_auth/session')).body.user).toBeUndefined()
    // Signing in again works, and the ended cookie cannot sign the new session out.
    const again = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
    await stolen('DELETE', '/api/_auth/session')
    expect((await again.get('/api/me')).status).toBe(200)
  })

  it('a password reset ends every session, and voids the user\'s other reset links', async () => {
    const reader = await ApiClient.signedIn(server.url, READER.email, READER.password)
    const stolen = copyOf(reader)
    const older = await resetLink(READER.email)
    const newer = await resetLink(READER.email)
    // Asking for a new link voided the older one.
    expect(
      (
        await new ApiClient(server.url).post('/api/account/password-reset/complete', {
          token: older,
          password: 'kelp rope harbour lantern',
        })
      ).status,
    ).toBe(404)

    expect(
      (
        await new ApiClient(server.url).post('/api/account/password-reset/complete', {
          token: newer,
          password: 'kelp rope harbour lantern',
        })
      ).status,
    ).toBe(200)
    expect((await reader.get('/api/me')).status).toBe(401)
    expect((await stolen('GET', '/api/me')).status).toBe(401)
    await ApiClient.signedIn(server.url, READER.email, 'kelp rope harbour lantern')
  })

  it('disabling a user ends their sessions for good: enabling them again does not revive the old cookie', async () => {
    const operator = await ApiClient.signedIn(server.url, OPERATOR.email, OPERATOR.password)
    const email = 'sessions.person@caldwyn.example'
    const organisationId = (await operator.get('/api/me')).body.user.organisationId
    const created = await operator.post('/api/admin/users', {
      email,
      name: 'Session Person',
      role: 'reader',
      organisationId,
      password: 'harbour wall lichen',
    })
    expect(created.status).toBe(201)
    const person = await ApiClient.signedIn(server.url, email, 'harbour wall lichen')
    const stolen = copyOf(person)

    expect((await operator.patch(`/api/admin/users/${created.body.id}`, { disabled: true })).status).toBe(200)
    expect((await operator.patch(`/api/admin/users/${created.body.id}`, { disabled: false })).status).toBe(200)
    expect((await stolen('GET', '/api/me')).status).toBe(401)
    expect((await (await ApiClient.signedIn(server.url, email, 'harbour wall lichen')).get('/api/me')).status).toBe(200)
  })
})
