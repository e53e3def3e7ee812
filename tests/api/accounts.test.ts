import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ADMIN, OPERATOR, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { TestSmtp, isTo, linkIn } from '../support/smtp'

let server: RunningServer
let smtp: TestSmtp
let admin: ApiClient

const tokenFrom = (text: string, path: string) =>
  new URL(linkIn({ text } as never, `${server.url}${path}?token=`)).searchParams.get('token')!

beforeAll(async () => {
  smtp = await new TestSmtp().start()
  server = await startServer({ SMTP_URL: smtp.url, MAIL_POLL_MS: '200' })
  admin = new ApiClient(server.url)
  await admin.signIn(ADMIN.email, ADMIN.password)
})
afterAll(async () => {
  await server?.stop()
  await smtp?.stop()
})

describe('invitations', () => {
  it('an admin invites by e-mail; the link sets a password once and signs the new user in', async () => {
    const council = (await admin.get('/api/organisations')).body.find((o: { kind: string }) => o.kind === 'council')
    const sent = await admin.post('/api/admin/invitations', {
      email: 'engineer@skerrow.example',
      name: 'Bryn Oakes',
      role: 'planner',
      organisationId: council.id,
      language: 'es',
    })
    expect(sent.status).toBe(202)
    const mail = await smtp.next(isTo('engineer@skerrow.example'))
    expect(mail.subject).toBe('Invitación a Brinkwater de Morwen Tallis')
    const token = tokenFrom(mail.text!, '/account/invitation')

    const preview = await new ApiClient(server.url).get(`/api/account/invitation?token=${token}`)
    expect(preview.body).toMatchObject({
      email: 'engineer@skerrow.example',
      role: 'planner',
      organisation: council.name,
    })

    const short = await new ApiClient(server.url).post('/api/account/invitation/accept', { token, password: 'short' })
    expect(short.status).toBe(400)
    expect(short.body.message).toMatch(/^password: Use at least 12 characters/)

    const invitee = new ApiClient(server.url)
    const accepted = await invitee.post('/api/account/invitation/accept', { token, password: 'a-fine-long-password' })
    expect(accepted.status).toBe(201)
    expect((await invitee.get('/api/me')).body.user).toMatchObject({
      email: 'engineer@skerrow.example',
      role: 'planner',
      organisationName: council.name,
    })

    const replay = await new ApiClient(server.url).post('/api/account/invitation/accept', {
      token,
      password: 'another-long-password',
    })
    expect(replay.status).toBe(404)
    expect(replay.body.message).toMatch(/already been used/)
  })

  it('refuses to invite an address that already has an account, and non-admins', async () => {
    const [org] = (await admin.get('/api/organisations')).body
    const taken = await admin.post('/api/admin/invitations', {
      email: READER.email,
      name: 'Again',
      role: 'reader',
      organisationId: org.id,
    })
    expect(taken.status).toBe(409)
    const reader = new ApiClient(server.url)
    await reader.signIn(READER.email, READER.password)
    expect(
      (
        await reader.post('/api/admin/invitations', {
          email: 'x@example.org',
          name: 'X',
          role: 'admin',
          organisationId: org.id,
        })
      ).status,
    ).toBe(403)
    expect((await new ApiClient(server.url).post('/api/admin/invitations', {})).status).toBe(401)
  })
})

describe('password reset', () => {
  it('answers the same whether or not the address exists, and mails only real accounts', async () => {
    const known = await new ApiClient(server.url).post('/api/account/password-reset', { email: READER.email })
    const unknown = await new ApiClient(server.url).post('/api/account/password-reset', { email: 'nobody@example.org' })
    expect(known.status).toBe(202)
    expect(unknown.status).toBe(202)
    expect(unknown.body).toEqual(known.body)
    const mail = await smtp.next(isTo(READER.email))
    expect(mail.subject).toBe('Reset your Brinkwater password')
    expect(smtp.to('nobody@example.org')).toHaveLength(0)

    const token = tokenFrom(mail.text!, '/account/reset')
    const done = await new ApiClient(server.url).post('/api/account/password-reset/complete', {
      token,
      password: 'a-brand-new-password',
    })
    expect(done.status).toBe(200)
    expect(
      (await new ApiClient(server.url).post('/api/auth/sign-in', { email: READER.email, password: READER.password }))
        .status,
    ).toBe(401)
    await new ApiClient(server.url).signIn(READER.email, 'a-brand-new-password')
    expect(
      (
        await new ApiClient(server.url).post('/api/account/password-reset/complete', {
          token,
          password: 'yet-another-password',
        })
      ).status,
    ).toBe(404)
  })

  it('refuses a malformed token and limits requests per address', async () => {
    expect(
      (
        await new ApiClient(server.url).post('/api/account/password-reset/complete', {
          token: 'bad',
          password: 'a-brand-new-password',
        })
      ).status,
    ).toBe(400)
    const statuses: number[] = []
    for (let i = 0; i < 4; i++)
      statuses.push(
        (await new ApiClient(server.url).post('/api/account/password-reset', { email: 'flood@example.org' })).status,
      )
    expect(statuses).toEqual([202, 202, 202, 429])
  })
})

describe('the demo mailbox', () => {
  it('is not there once a real mail server is set: mail belongs in people\'s own inboxes', async () => {
    const operator = await ApiClient.signedIn(server.url, OPERATOR.email, OPERATOR.password)
    const answer = await operator.get('/api/admin/mailbox')
    expect(answer.status).toBe(404)
    expect(answer.body.message).toMatch(/SMTP_URL/)
  })
})
