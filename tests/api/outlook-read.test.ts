import { request as httpRequest, type IncomingHttpHeaders } from 'node:http'
import { gunzipSync } from 'node:zlib'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// Reading an outlook: the stored outlook (immutable once done: ETag, 304, gzip) and its status (what
// changes while it is read). Raw HTTP, so the test sees the bytes and headers exactly as sent.

let server: RunningServer
let planner: ApiClient
let reader: ApiClient
let port: ApiClient
let siteId: string
let doneId: string

interface Raw { status: number, headers: IncomingHttpHeaders, body: Buffer }

function raw(api: ApiClient, path: string, headers: Record<string, string> = {}): Promise<Raw> {
  const { hostname, port } = new URL(server.url)
  return new Promise((resolve, reject) => {
    const outgoing = httpRequest(
      { host: hostname, port, path, headers: { accept: 'application/json', cookie: api.cookieHeader(), ...headers } },
      (incoming) => {
        const chunks: Buffer[] = []
        incoming.on('data', (chunk: Buffer) => chunks.push(chunk))
        incoming.on('end', () =>
          resolve({ status: incoming.statusCode ?? 0, headers: incoming.headers, body: Buffer.concat(chunks) }),
        )
        incoming.on('error', reject)
      },
    )
    outgoing.on('error', reject)
    outgoing.end()
  })
}

beforeAll(async () => {
  // One pool thread, so a large outlook stays running long enough to be seen running.
  server = await startServer({ OUTLOOK_WORKERS: '1' })
  planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
  reader = await ApiClient.signedIn(server.url, READER.email, READER.password)
  port = await ApiClient.signedIn(server.url, PORT_PLANNER.email, PORT_PLANNER.password)
  siteId = (await planner.get('/api/sites')).body[0].id
  const done = await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 31 })
  expect(done.status).toBe(201)
  doneId = done.body.id
})
afterAll(async () => { await server?.stop() })

describe('a finished outlook', () => {
  it('carries the same strong ETag on every read, must be revalidated, and stays private', async () => {
    const [first, second] = [
      await raw(reader, `/api/outlooks/${doneId}`),
      await raw(planner, `/api/outlooks/${doneId}`),
    ]
    expect(first.status).toBe(200)
    expect(first.headers.etag).toMatch(/^"[\w-]+"$/)
    expect(second.headers.etag).toBe(first.headers.etag)
    expect(first.headers['cache-control']).toBe('private, no-cache')
    expect(first.headers.vary).toMatch(/accept-encoding/i)
    expect(Number(first.headers['content-length'])).toBe(first.body.length)
    const outlook = JSON.parse(first.body.toString('utf8'))
    expect(outlook).toMatchObject({
      id: doneId,
      siteId,
      state: 'done',
      scenario: 'SSP2-4.5',
      samples: 20_000,
      seed: 31,
    })
    // The lease and the live fields are not part of the stored outlook.
    for (const field of ['claimedBy', 'leaseUntil', 'attempts', 'progress', 'siteName', 'newerScience', 'storylines'])
      expect(outlook).not.toHaveProperty(field)
  })

  it('answers 304 with no body when the reader has it, and 200 when the ETag is another', async () => {
    const { headers } = await raw(planner, `/api/outlooks/${doneId}`)
    const again = await raw(planner, `/api/outlooks/${doneId}`, { 'if-none-match': headers.etag! })
    expect(again.status).toBe(304)
    expect(again.body.length).toBe(0)
    expect(again.headers.etag).toBe(headers.etag)
    // A list and a weak form of the same tag match too (If-None-Match compares weakly).
    expect(
      (await raw(planner, `/api/outlooks/${doneId}`, { 'if-none-match': `"other", W/${headers.etag}` })).status,
    ).toBe(304)
    const changed = await raw(planner, `/api/outlooks/${doneId}`, { 'if-none-match': '"not-this-one"' })
    expect(changed.status).toBe(200)
    expect(changed.body.length).toBeGreaterThan(1000)
  })

  it('is 404 for another organisation even with the right ETag, and tells it no ETag', async () => {
    const { headers } = await raw(planner, `/api/outlooks/${doneId}`)
    const foreign = await raw(port, `/api/outlooks/${doneId}`, { 'if-none-match': headers.etag! })
    expect(foreign.status).toBe(404)
    expect(foreign.headers.etag).toBeUndefined()
    expect(JSON.parse(foreign.body.toString('utf8')).message).toBe('No such outlook.')
    expect((await raw(port, `/api/outlooks/${doneId}/status`)).status).toBe(404)
    expect(
      (await raw(new ApiClient(server.url), `/api/outlooks/${doneId}`, { 'if-none-match': headers.etag! })).status,
    ).toBe(401)
  })

  it('is gzip-encoded for a reader that accepts it, the same JSON once decompressed, with its own ETag', async () => {
    const plain = await raw(planner, `/api/outlooks/${doneId}`, { 'accept-encoding': 'identity' })
    expect(plain.headers['content-encoding']).toBeUndefined()
    const zipped = await raw(planner, `/api/outlooks/${doneId}`, { 'accept-encoding': 'gzip, deflate, br' })
    expect(zipped.headers['content-encoding']).toBe('gzip')
    expect(Number(zipped.headers['content-length'])).toBe(zipped.body.length)
    expect(zipped.body.length).toBeLessThan(plain.body.length / 2)
    expect(gunzipSync(zipped.body).equals(plain.body)).toBe(true)
    expect(zipped.headers.etag).not.toBe(plain.headers.etag)
    const revalidated = await raw(planner, `/api/outlooks/${doneId}`, {
      'accept-encoding': 'gzip',
      'if-none-match': zipped.headers.etag!,
    })
    expect(revalidated.status).toBe(304)
    // Refused gzip (q=0) is not sent gzip.
    expect(
      (await raw(planner, `/api/outlooks/${doneId}`, { 'accept-encoding': 'gzip;q=0, identity' })).headers[
        'content-encoding'
      ],
    ).toBeUndefined()
  })

  it('has a status with its site, science and storylines, for any member of the organisation', async () => {
    const status = await raw(reader, `/api/outlooks/${doneId}/status`)
    expect(status.status).toBe(200)
    expect(status.headers['cache-control']).toBe('private, no-store')
    expect(status.headers.etag).toBeUndefined()
    const body = JSON.parse(status.body.toString('utf8'))
    const site = (await planner.get(`/api/sites/${siteId}`)).body
    expect(body).toEqual({
      state: 'done', progress: null, siteName: site.name, referenceLevel: site.referenceLevel,
      newerScience: [], offeredScience: expect.any(Array), storylines: expect.any(Array),
    })
    expect((await raw(new ApiClient(server.url), `/api/outlooks/${doneId}/status`)).status).toBe(401)
    // A malformed id names no outlook: 404, as for a missing one.
    expect((await raw(planner, '/api/outlooks/not-an-id/status')).status).toBe(404)
    expect((await raw(planner, '/api/outlooks/00000000-0000-4000-8000-000000000000/status')).status).toBe(404)
  })
})

describe('a running outlook', () => {
  it('has no ETag and is never kept, and its status reports progress until it is done', async () => {
    const queued = await planner.post(`/api/sites/${siteId}/outlooks`, {
      scenario: 'SSP2-4.5',
      samples: 2_000_000,
      seed: 32,
      wait: false,
    })
    expect(queued.status).toBe(202)
    const running = await raw(planner, `/api/outlooks/${queued.body.id}`)
    expect(JSON.parse(running.body.toString('utf8'))).toMatchObject({ state: 'running', result: null })
    expect(running.headers.etag).toBeUndefined()
    expect(running.headers['cache-control']).toBe('private, no-store')
    expect(running.headers['content-encoding']).toBeUndefined()

    // The heartbeat records the share of samples drawn; the status reports it while the run goes on.
    const seen: number[] = []
    await expect.poll(async () => {
      const status = (await reader.get(`/api/outlooks/${queued.body.id}/status`)).body
      if (status.state === 'running' && status.progress !== null) seen.push(status.progress)
      return status.state
    }, { timeout: 120_000, interval: 100 }).toBe('done')
    expect(seen.some(progress => progress > 0 && progress <= 1)).toBe(true)
    const status = (await reader.get(`/api/outlooks/${queued.body.id}/status`)).body
    expect(status.progress).toBeNull()
    // Once done, the stored outlook has its result and an ETag.
    const finished = await raw(planner, `/api/outlooks/${queued.body.id}`)
    expect(finished.headers.etag).toMatch(/^"[\w-]+"$/)
    expect(JSON.parse(finished.body.toString('utf8')).result.years.length).toBeGreaterThan(1)
  })
})
