import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ADMIN, ANALYST, OPERATOR, PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

let server: RunningServer
const client = () => new ApiClient(server.url)

beforeAll(async () => { server = await startServer() })
afterAll(async () => { await server?.stop() })

describe('signing in', () => {
  it.each([OPERATOR, ADMIN, ANALYST, PLANNER, PORT_PLANNER, READER])(
    'signs in $email with the seeded role',
    async (demo) => {
      const api = client()
      const user = await api.signIn(demo.email, demo.password)
      expect(user).toMatchObject({ email: demo.email, role: demo.role, organisationIllustrative: true })
      expect(user).not.toHaveProperty('passwordHash')
      expect((await api.get('/api/me')).body.user.email).toBe(demo.email)
    },
  )

  it('gives one generic answer for a wrong password and an unknown address', async () => {
    const wrongPassword = await client().post('/api/auth/sign-in', {
      email: PLANNER.email,
      password: 'not-the-password',
    })
    const unknownAddress = await client().post('/api/auth/sign-in', {
      email: 'nobody@caldwyn.example',
      password: PLANNER.password,
    })
    expect(wrongPassword.status).toBe(401)
    expect(unknownAddress.status).toBe(401)
    expect(wrongPassword.body.message).toBe(unknownAddress.body.message)
    expect(wrongPassword.body.message).not.toMatch(/password is|no such|unknown/i)
  })

  it('treats the address case-insensitively', async () => {
    const user = await client().signIn(READER.email.toUpperCase(), READER.password)
    expect(user.email).toBe(READER.email)
  })

  it('refuses malformed JSON and missing fields with a message naming the field', async () => {
    const malformed = await client().request('POST', '/api/auth/sign-in', undefined, { rawBody: '{"email": ' })
    expect(malformed.status).toBe(400)
    expect(malformed.body.message).toMatch(/not valid JSON/)

    const missing = await client().post('/api/auth/sign-in', { email: PLANNER.email })
    expect(missing.status).toBe(400)
    expect(missing.body.data.issues).toEqual([{ field: 'password', message: 'Enter your password.' }])

    const badEmail = await client().post('/api/auth/sign-in', { email: 'not-an-address', password: 'x' })
    expect(badEmail.status).toBe(400)
    expect(badEmail.body.message).toMatch(/^email: /)
  })

  it('signs out: the session no longer opens anything', async () => {
    const api = client()
    await api.signIn(PLANNER.email, PLANNER.password)
    expect((await api.request('DELETE', '/api/_auth/session')).status).toBe(200)
    expect((await api.get('/api/me')).status).toBe(401)
  })
})

describe('who may ask', () => {
  it('answers 401 without a session', async () => {
    expect((await client().get('/api/me')).status).toBe(401)
    expect((await client().get('/api/admin/users')).status).toBe(401)
    expect((await client().get('/api/admin/audit')).status).toBe(401)
  })

  it('answers 401 before validating anything for an anonymous write', async () => {
    const response = await client().request('PATCH', '/api/admin/users/not-a-uuid', undefined, { rawBody: '{broken' })
    expect(response.status).toBe(401)
  })

  it.each([READER, PLANNER, ANALYST])('answers 403 to $role on admin routes', async (demo) => {
    const api = client()
    await api.signIn(demo.email, demo.password)
    expect((await api.get('/api/admin/users')).status).toBe(403)
    expect((await api.get('/api/organisations')).status).toBe(403)
    const create = await api.post('/api/admin/users', {
      email: 'x@y.example',
      name: 'X',
      role: 'admin',
      organisationId: '00000000-0000-4000-8000-000000000000',
      password: 'long-enough-password',
    })
    expect(create.status).toBe(403)
    expect(create.body.message).toMatch(/admin role/)
  })

  it('redirects a signed-out browser from the overview to the sign-in page', async () => {
    const page = await client().request('GET', '/', undefined, { headers: { accept: 'text/html' } })
    expect(page.status).toBe(302)
    expect(page.headers.get('location')).toBe('/sign-in')
  })
})

describe('administering users', () => {
  async function admin() {
    const api = client()
    await api.signIn(ADMIN.email, ADMIN.password)
    return api
  }
  async function operator() {
    const api = client()
    await api.signIn(OPERATOR.email, OPERATOR.password)
    return api
  }

  async function userId(api: ApiClient, email: string): Promise<string> {
    const list = await api.get('/api/admin/users')
    return list.body.find((row: { email: string }) => row.email === email).id
  }

  it('creates a user who can then sign in, and writes it to the audit log', async () => {
    const api = await operator()
    const organisations = (await api.get('/api/organisations')).body
    const port = organisations.find((org: { kind: string }) => org.kind === 'port')
    const created = await api.post('/api/admin/users', {
      email: 'New.Engineer@Skerrow.example',
      name: 'Ada Quill',
      role: 'planner',
      organisationId: port.id,
      password: 'a-long-first-password',
    })
    expect(created.status).toBe(201)
    expect(created.body).toMatchObject({ email: 'new.engineer@skerrow.example', role: 'planner', disabled: false })

    const user = await client().signIn('new.engineer@skerrow.example', 'a-long-first-password')
    expect(user.organisationName).toBe(port.name)

    const audit = (await api.get('/api/admin/audit')).body
    expect(
      audit.some(
        (entry: { action: string, targetId: string }) =>
          entry.action === 'user.created' && entry.targetId === created.body.id,
      ),
    ).toBe(true)
  })

  it('refuses a duplicate address, a short password and an unknown organisation', async () => {
    const api = await admin()
    const [org] = (await api.get('/api/organisations')).body
    const duplicate = await api.post('/api/admin/users', {
      email: READER.email,
      name: 'Copy',
      role: 'reader',
      organisationId: org.id,
      password: 'a-long-first-password',
    })
    expect(duplicate.status).toBe(409)
    expect(duplicate.body.message).toMatch(/already has an account/)

    const short = await api.post('/api/admin/users', {
      email: 'short@caldwyn.example',
      name: 'Short',
      role: 'reader',
      organisationId: org.id,
      password: 'short',
    })
    expect(short.status).toBe(400)
    expect(short.body.data.issues).toEqual([{ field: 'password', message: 'Use at least 12 characters.' }])

    const orphan = await api.post('/api/admin/users', {
      email: 'orphan@caldwyn.example',
      name: 'Orphan',
      role: 'reader',
      organisationId: '00000000-0000-4000-8000-000000000000',
      password: 'a-long-first-password',
    })
    expect(orphan.status).toBe(400)
    expect(orphan.body.message).toMatch(/^organisationId: /)

    expect(
      (await api.get('/api/admin/users')).body.some((row: { email: string }) => row.email === 'short@caldwyn.example'),
    ).toBe(false)
  })

  it('disabling a user ends their session at once and refuses their sign-in', async () => {
    const api = await operator()
    const planner = client()
    await planner.signIn(PORT_PLANNER.email, PORT_PLANNER.password)
    const id = await userId(api, PORT_PLANNER.email)

    expect((await api.patch(`/api/admin/users/${id}`, { disabled: true })).status).toBe(200)
    expect((await planner.get('/api/me')).status).toBe(401)
    const again = await client().post('/api/auth/sign-in', {
      email: PORT_PLANNER.email,
      password: PORT_PLANNER.password,
    })
    expect(again.status).toBe(403)

    await api.patch(`/api/admin/users/${id}`, { disabled: false })
    await client().signIn(PORT_PLANNER.email, PORT_PLANNER.password)
  })

  it('a change of role takes effect on the next request of an open session', async () => {
    const api = await admin()
    const reader = client()
    await reader.signIn(READER.email, READER.password)
    expect((await reader.get('/api/admin/users')).status).toBe(403)

    const id = await userId(api, READER.email)
    await api.patch(`/api/admin/users/${id}`, { role: 'admin' })
    expect((await reader.get('/api/admin/users')).status).toBe(200)
    await api.patch(`/api/admin/users/${id}`, { role: 'reader' })
    expect((await reader.get('/api/admin/users')).status).toBe(403)
  })

  it('never locks out the last administrator', async () => {
    const api = await admin()
    const id = await userId(api, ADMIN.email)
    const disable = await api.patch(`/api/admin/users/${id}`, { disabled: true })
    expect(disable.status).toBe(409)
    expect(disable.body.message).toMatch(/last active administrator/)
    const demote = await api.patch(`/api/admin/users/${id}`, { role: 'planner' })
    expect(demote.status).toBe(409)
    expect((await api.get('/api/me')).body.user.role).toBe('admin')
  })

  it('refuses an empty patch, an unknown role and an unknown user', async () => {
    const api = await admin()
    const id = await userId(api, READER.email)
    const empty = await api.patch(`/api/admin/users/${id}`, {})
    expect(empty.status).toBe(400)
    expect(empty.body.message).toMatch(/at least one of name, role or disabled/)
    const role = await api.patch(`/api/admin/users/${id}`, { role: 'superuser' })
    expect(role.status).toBe(400)
    expect(role.body.message).toMatch(/^role: Choose one of: operator, admin, analyst, planner, reader/)
    expect((await api.patch('/api/admin/users/00000000-0000-4000-8000-000000000000', { role: 'reader' })).status).toBe(
      404,
    )
    expect((await api.patch('/api/admin/users/../../etc', { role: 'reader' })).status).toBe(404)
  })
})

describe('preferences', () => {
  it('remembers a supported language and refuses another', async () => {
    const api = client()
    await api.signIn(PLANNER.email, PLANNER.password)
    expect((await api.patch('/api/me', { locale: 'es' })).body.user.locale).toBe('es')
    expect((await api.get('/api/me')).body.user.locale).toBe('es')
    const french = await api.patch('/api/me', { locale: 'fr' })
    expect(french.status).toBe(400)
    expect(french.body.message).toMatch(/^locale: Choose one of: en, es/)
  })
})
