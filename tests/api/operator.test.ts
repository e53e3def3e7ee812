import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ADMIN, OPERATOR, PORT_PLANNER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// An organisation's admin keeps their own organisation's people; the instance (every organisation,
// the demo mailbox with everyone's reset links) is the operator's. Before the split, the council's
// admin could ask for the harbour planner's reset link and read it in the mailbox.

let server: RunningServer
let admin: ApiClient
let operator: ApiClient

beforeAll(async () => {
  server = await startServer()
  ;[admin, operator] = await Promise.all([
    ApiClient.signedIn(server.url, ADMIN.email, ADMIN.password),
    ApiClient.signedIn(server.url, OPERATOR.email, OPERATOR.password),
  ])
})
afterAll(async () => { await server?.stop() })

const emails = (rows: { email: string }[]) => rows.map(row => row.email)

describe('an organisation\'s admin', () => {
  it('cannot read the mailbox, so cannot take over another organisation\'s account with its reset link', async () => {
    expect(
      (await new ApiClient(server.url).post('/api/account/password-reset', { email: PORT_PLANNER.email })).status,
    ).toBe(202)
    const refused = await admin.get('/api/admin/mailbox')
    expect(refused.status).toBe(403)
    expect(refused.body.message).toBe('This needs the operator role.')
    // The operator reads it on the demo, where it stands in for people's inboxes.
    await expect
      .poll(async () =>
        (await operator.get('/api/admin/mailbox')).body.some((m: { to: string[] }) =>
          m.to.includes(PORT_PLANNER.email),
        ),
      )
      .toBe(true)
  })

  it('sees and changes only their own organisation\'s people', async () => {
    const mine = (await admin.get('/api/admin/users')).body
    expect(emails(mine)).toContain(ADMIN.email)
    expect(emails(mine)).not.toContain(PORT_PLANNER.email)
    expect((await admin.get('/api/organisations')).body).toHaveLength(1)

    const everyone = (await operator.get('/api/admin/users')).body as { id: string, email: string }[]
    const portPlanner = everyone.find(user => user.email === PORT_PLANNER.email)!
    const patched = await admin.patch(`/api/admin/users/${portPlanner.id}`, { role: 'admin' })
    expect(patched.status).toBe(404)
    expect(patched.body.message).toBe('No such user.')
  })

  it('cannot make anyone an operator, nor unmake the operator', async () => {
    const everyone = (await operator.get('/api/admin/users')).body as { id: string, email: string }[]
    const self = everyone.find(user => user.email === ADMIN.email)!
    const promote = await admin.patch(`/api/admin/users/${self.id}`, { role: 'operator' })
    expect(promote.status).toBe(403)
    expect(promote.body.message).toMatch(/^role: Making someone an operator needs the operator role/)
    const theOperator = everyone.find(user => user.email === OPERATOR.email)!
    expect((await admin.patch(`/api/admin/users/${theOperator.id}`, { disabled: true })).status).toBe(403)
    const invite = await admin.post('/api/admin/invitations', {
      email: 'second.operator@caldwyn.example',
      name: 'Second',
      role: 'operator',
      organisationId: (await admin.get('/api/me')).body.user.organisationId,
    })
    expect(invite.status).toBe(403)
  })

  it('reads only their own organisation\'s audit lines', async () => {
    const port = ((await operator.get('/api/organisations')).body as { id: string, kind: string }[]).find(
      org => org.kind === 'port',
    )!
    const email = 'audited@skerrow.example'
    expect(
      (
        await operator.post('/api/admin/users', {
          email,
          name: 'Audited',
          role: 'reader',
          organisationId: port.id,
          password: 'harbour wall lichen',
        })
      ).status,
    ).toBe(201)
    const mentions = async (api: ApiClient) =>
      ((await api.get('/api/admin/audit?limit=500')).body as { detail: { email?: string } }[]).some(
        line => line.detail.email === email,
      )
    expect(await mentions(operator)).toBe(true)
    expect(await mentions(admin)).toBe(false)
  })
})
