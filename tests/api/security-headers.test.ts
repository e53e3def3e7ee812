import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

let server: RunningServer
let planner: ApiClient

/** The directives of a Content-Security-Policy header, by name. */
function directives(header: string | null) {
  return Object.fromEntries((header ?? '').split(';').map(part => part.trim()).filter(Boolean)
    .map((part) => {
      const [name, ...sources] = part.split(/\s+/)
      return [name!, sources]
    }))
}
const nonceOf = (csp: string | null) => /'nonce-([^']+)'/.exec(csp ?? '')?.[1]
const tagNonces = (html: string) => [...html.matchAll(/<script\b[^>]*\bnonce="([^"]+)"/g)].map(match => match[1])

async function page(path: string, api?: ApiClient) {
  const response = api
    ? await api.fetchRaw(path)
    : await fetch(server.url + path, { headers: { accept: 'text/html' }, redirect: 'manual' })
  return { response, html: await response.text() }
}

/** An issued Kelwick briefing shared by link; returns its id and token. */
async function sharedBriefing() {
  const site = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick')
  const thresholdIds = (await planner.get(`/api/sites/${site.id}`)).body.thresholds.map((t: { id: string }) => t.id)
  const outlook = await planner.post(`/api/sites/${site.id}/outlooks`, {
    scenario: 'SSP2-4.5',
    samples: 20_000,
    wait: true,
  })
  const draft = await planner.post('/api/briefings', {
    outlookId: outlook.body.id, comparisonOutlookIds: [], title: 'Kelwick to 2100', audience: 'Harbour committee',
    localContext: 'Quay Street floods at spring tides.', language: 'en', units: 'm', thresholdIds, years: [2050, 2100],
  })
  await planner.post(`/api/briefings/${draft.body.id}/issue`)
  const shared = await planner.post(`/api/briefings/${draft.body.id}/share`)
  return { id: draft.body.id as string, token: shared.body.shareToken as string }
}

beforeAll(async () => {
  server = await startServer()
  planner = new ApiClient(server.url)
  await planner.signIn(PLANNER.email, PLANNER.password)
})
afterAll(async () => { await server?.stop() })

describe('security headers on plain http', () => {
  it('sends a nonce-based content security policy whose nonce is on every script the page renders', async () => {
    const { response, html } = await page('/sign-in')
    expect(response.status).toBe(200)
    const csp = response.headers.get('content-security-policy')
    const policy = directives(csp)
    expect(policy['script-src']).toEqual(expect.arrayContaining(['\'self\'', '\'strict-dynamic\'']))
    expect(policy['script-src']).not.toContain('\'unsafe-inline\'')
    expect(policy['script-src']).not.toContain('\'unsafe-eval\'')
    expect(policy['object-src']).toEqual(['\'none\''])
    expect(policy['base-uri']).toEqual(['\'none\''])
    expect(policy['frame-ancestors']).toEqual(['\'none\''])
    expect(policy['form-action']).toEqual(['\'self\''])
    expect(policy['connect-src']).toEqual(['\'self\''])
    expect(policy['img-src']).toEqual(['\'self\'', 'data:', 'blob:'])
    expect(policy['worker-src']).toEqual(['\'self\'', 'blob:'])
    // On http, upgrading requests would send the browser to an https port that does not exist.
    expect(policy).not.toHaveProperty('upgrade-insecure-requests')

    const nonce = nonceOf(csp)
    expect(nonce).toMatch(/^[\w+/=-]{16,}$/)
    const nonces = tagNonces(html)
    expect(nonces.length).toBeGreaterThan(0)
    expect(new Set(nonces)).toEqual(new Set([nonce]))
    // A fresh nonce for every response.
    expect(nonceOf((await page('/sign-in')).response.headers.get('content-security-policy'))).not.toBe(nonce)
  })

  it('sends the other protective headers, and no HSTS or CORS headers on http', async () => {
    const { response } = await page('/sign-in')
    expect(response.headers.get('x-content-type-options')).toBe('nosniff')
    expect(response.headers.get('referrer-policy')).toBe('strict-origin-when-cross-origin')
    expect(response.headers.get('cross-origin-opener-policy')).toBe('same-origin')
    expect(response.headers.get('x-frame-options')).toBe('DENY')
    expect(response.headers.get('permissions-policy')).toMatch(/camera=\(\).*geolocation=\(\).*microphone=\(\)/)
    expect(response.headers.get('strict-transport-security')).toBeNull()
    expect(response.headers.get('access-control-allow-origin')).toBeNull()
    expect(response.headers.get('x-powered-by')).toBeNull()

    const api = await fetch(`${server.url}/api/health`)
    expect(api.headers.get('x-content-type-options')).toBe('nosniff')
    expect(api.headers.get('access-control-allow-origin')).toBeNull()
  })

  it('sets the session cookie HttpOnly and SameSite=Lax for twelve hours, not Secure on http', async () => {
    const response = await fetch(`${server.url}/api/auth/sign-in`, {
      method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ email: PLANNER.email, password: PLANNER.password }),
    })
    const cookie = response.headers.getSetCookie().find(line => line.startsWith('brinkwater-session='))!
    expect(cookie).toMatch(/; HttpOnly/i)
    expect(cookie).toMatch(/; SameSite=Lax/i)
    expect(cookie).not.toMatch(/; Secure/i)
    const expires = new Date(/Expires=([^;]+)/i.exec(cookie)![1]!).getTime()
    expect(expires - Date.now()).toBeGreaterThan(11.9 * 3_600_000)
    expect(expires - Date.now()).toBeLessThanOrEqual(12 * 3_600_000)
  })
})

describe('the shared briefing page cache', () => {
  it('asks browsers and proxies to keep no copy of pages, JSON, shared pages and redirects, and no redirect carries a nonce placeholder', async () => {
    const { token } = await sharedBriefing()
    const answers = [
      await planner.fetchRaw('/sites'),
      await planner.fetchRaw('/api/me'),
      await planner.fetchRaw('/api/sites'),
      (await page(`/shared/${token}`)).response,
      (await page(`/shared/${token}`)).response, // from the page cache
      (await page('/sites')).response, // signed out: a redirect to the sign-in page
    ]
    for (const answer of answers) expect(answer.headers.get('cache-control'), answer.url).toBe('private, no-store')
    const redirect = answers.at(-1)!
    expect(redirect.status).toBe(302)
    expect(redirect.headers.get('content-security-policy')).not.toContain('{{nonce}}')
    expect(redirect.headers.get('content-security-policy')).toContain('script-src \'self\'')
    // Built files keep their long cache life.
    const html = await (await planner.fetchRaw('/sites')).text()
    const asset = /\/_nuxt\/[\w.-]+\.js/.exec(html)![0]
    expect((await fetch(server.url + asset)).headers.get('cache-control')).toMatch(/max-age=\d{5,}/)
  })

  it('serves a shared page from the cache with a fresh nonce each time, and the PDF still downloads', async () => {
    const { token } = await sharedBriefing()
    const first = await page(`/shared/${token}`)
    expect(first.response.status).toBe(200)
    expect(first.response.headers.get('x-page-cache')).toBe('miss')
    const second = await page(`/shared/${token}`)
    expect(second.response.headers.get('x-page-cache')).toBe('hit')
    expect(second.html).toContain('Kelwick to 2100')

    const nonces = [first, second].map(({ response }) => nonceOf(response.headers.get('content-security-policy')))
    expect(nonces[0]).not.toBe(nonces[1])
    expect(new Set(tagNonces(second.html))).toEqual(new Set([nonces[1]]))
    expect(second.html).not.toContain(nonces[0])
    expect(second.response.headers.get('x-content-type-options')).toBe('nosniff')

    const pdf = await fetch(`${server.url}/api/shared/${token}/pdf`)
    expect(pdf.status).toBe(200)
    expect(pdf.headers.get('content-type')).toBe('application/pdf')
    expect(pdf.headers.get('content-disposition')).toMatch(/^attachment; filename=".+\.pdf"$/)
  })

  it('sends a cached page gzip-encoded to readers that accept it and plain to those that do not', async () => {
    const { token } = await sharedBriefing()
    await page(`/shared/${token}`)
    const read = async (encoding: string) => {
      const response = await fetch(`${server.url}/shared/${token}`, {
        headers: { 'accept': 'text/html', 'accept-encoding': encoding },
      })
      // fetch inflates the body and checks the gzip trailer (CRC-32 and length) as it does.
      const html = await response.text()
      return { response, withoutNonce: html.replaceAll(nonceOf(response.headers.get('content-security-policy'))!, '') }
    }
    const gzip = await read('gzip, deflate, br')
    const plain = await read('identity')
    const refused = await read('gzip;q=0')
    for (const { response } of [gzip, plain, refused]) {
      expect(response.headers.get('x-page-cache')).toBe('hit')
      expect(response.headers.get('vary')).toMatch(/accept-encoding/i)
    }
    expect(gzip.response.headers.get('content-encoding')).toBe('gzip')
    expect(Number(gzip.response.headers.get('content-length'))).toBeLessThan(plain.withoutNonce.length / 2)
    expect(plain.response.headers.get('content-encoding')).toBeNull()
    expect(refused.response.headers.get('content-encoding')).toBeNull()
    expect(gzip.withoutNonce).toBe(plain.withoutNonce)
    expect(gzip.withoutNonce).toContain('Kelwick to 2100')
  })

  it('never serves a signed-in reader from the cache', async () => {
    const { token } = await sharedBriefing()
    await page(`/shared/${token}`)
    const signedIn = await page(`/shared/${token}`, planner)
    expect(signedIn.response.status).toBe(200)
    expect(signedIn.response.headers.get('x-page-cache')).toBeNull()
  })

  it('stops serving a revoked link at once, even after the page was cached', async () => {
    const { id, token } = await sharedBriefing()
    await page(`/shared/${token}`)
    expect((await page(`/shared/${token}`)).response.headers.get('x-page-cache')).toBe('hit')

    expect((await planner.request('DELETE', `/api/briefings/${id}/share`)).status).toBe(200)
    const gone = await page(`/shared/${token}`)
    expect(gone.response.status).toBe(404)
    expect(gone.html).not.toContain('Kelwick to 2100')
    expect(gone.response.headers.get('x-page-cache')).toBeNull()
    expect((await page(`/shared/${token}`)).response.status).toBe(404)
  })

  it('keeps pages for different languages apart', async () => {
    const { token } = await sharedBriefing()
    const english = await page(`/shared/${token}`)
    const spanish = await fetch(`${server.url}/shared/${token}`, {
      headers: { accept: 'text/html', cookie: 'brinkwater_locale=es' },
    })
    const spanishHtml = await spanish.text()
    expect(spanish.headers.get('x-page-cache')).toBe('miss')
    expect(english.html).toContain('Shared copy')
    expect(spanishHtml).toContain('Copia compartida')
    expect((await page(`/shared/${token}`)).html).toContain('Shared copy')
  })
})

describe('security settings on https', () => {
  let secure: RunningServer
  beforeAll(async () => { secure = await startServer({ APP_URL: 'https://brinkwater.example' }) })
  afterAll(async () => { await secure?.stop() })

  it('marks the session cookie Secure and asks browsers to stay on https', async () => {
    const response = await fetch(`${secure.url}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ email: PLANNER.email, password: PLANNER.password }),
    })
    expect(response.status).toBe(200)
    expect(response.headers.getSetCookie().find(line => line.startsWith('brinkwater-session='))).toMatch(/; Secure/i)

    const html = await fetch(`${secure.url}/sign-in`, { headers: { accept: 'text/html' } })
    expect(html.headers.get('strict-transport-security')).toMatch(/max-age=31536000; includeSubDomains/i)
    expect(directives(html.headers.get('content-security-policy'))).toHaveProperty('upgrade-insecure-requests')
  })
})
