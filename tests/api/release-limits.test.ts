import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { MAX_UPLOADED_DRAWS } from '../../shared/releases/limits'
import { ApiClient } from '../support/client'
import { ANALYST } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

// Releases as large as the documented limits are previewed and saved.

let server: RunningServer
let analyst: ApiClient
const provenance = { method: 'Limit test.', citation: 'Limit test (2026).', licence: 'CC BY 4.0' }

beforeAll(async () => {
  server = await startServer()
  analyst = await ApiClient.signedIn(server.url, ANALYST.email, ANALYST.password)
})
afterAll(async () => { await server?.stop() })

describe('release size limits', () => {
  it(`previews and saves a samples release of ${MAX_UPLOADED_DRAWS.toLocaleString('en')} draws, the upload limit`, async () => {
    // One anchor year keeps the body small (about 0.9 MB); spreading the draws into a call once answered 500.
    const draws = Array.from({ length: MAX_UPLOADED_DRAWS }, (_, i) => [Number((0.1 + (i % 1000) / 10_000).toFixed(4))])
    const content = { form: 'samples', unit: 'm', baselineYear: 2020, anchorYears: [2100], draws, ...provenance }
    const preview = await analyst.post('/api/releases/preview', content)
    expect(preview.status, JSON.stringify(preview.body).slice(0, 300)).toBe(200)
    // [practice] the draws run evenly from 0.1 to 0.1999, so their median is about 0.15.
    expect(preview.body.bands.at(-1).p50).toBeCloseTo(0.15, 2)
    const created = await analyst.post('/api/releases', { series: { component: 'land-water', scenario: 'SSP2-4.5', title: 'Draws at the limit' }, ...content })
    expect(created.status, JSON.stringify(created.body).slice(0, 300)).toBe(201)
  })
})
