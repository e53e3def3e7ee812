import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { get as httpGet } from 'node:http'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { toCsv } from '../../shared/releases/csv'
import { ApiClient } from '../support/client'
import { ANALYST, OPERATOR, PLANNER, READER } from '../support/demo-users'
import { ANNUAL_MAXIMA_CSV, OUTLOOK_REQUEST, SITE_BODY } from '../support/matrix-fixtures'
import { startServer, type RunningServer } from '../support/server'
import { TestSmtp, isTo } from '../support/smtp'

// Malformed and hostile input across forms, uploads and parameters. Each refusal is a 4xx whose
// message names the field or the problem, and nothing is written. Hostile text that is a fair
// thing to type (markup, SQL, unusual Unicode) is stored as typed and always shown escaped.

type As = 'anonymous' | 'reader' | 'planner' | 'analyst' | 'admin'
const UUID_A = '00000000-0000-4000-8000-00000000000a'
const UUID_B = '00000000-0000-4000-8000-00000000000b'
interface Ctx {
  briefingId: string
  targetSiteId: string
  draftReleaseId: string
  outlookId: string
  thresholdIds: string[]
  portId: string
  councilId: string
  glaciersSeries: string
}
type Value<T> = T | ((c: Ctx) => T)
interface Hostile {
  as: As
  method: string
  path: Value<string>
  body?: Value<unknown>
  /** Sent as is (not JSON-encoded), for malformed bodies. */
  raw?: Value<string>
  headers?: Record<string, string>
  /** Send the path exactly as written, without the client resolving dot segments. */
  verbatim?: true
  status: number
  message: RegExp
}

const IMG = '<img src=x onerror=alert(1)>'
const SCRIPT = '<script>alert("x")</script>'
const PROVENANCE = { method: 'Hostile test method.', citation: 'Hostile (2026).', licence: 'CC BY 4.0' }
const quantiles = (csv: string) => ({
  series: { component: 'glaciers', scenario: 'SSP2-4.5', title: 'Hostile upload' },
  form: 'quantiles',
  baselineYear: 2020,
  csv,
  ...PROVENANCE,
})
const withCell = (cell: string) => `level,2100\n0.17,0.1\n0.5,${cell}\n0.83,0.4\n`
const site = (overrides: Record<string, unknown> = {}) => ({ ...SITE_BODY('Hostile Point'), ...overrides })
const land = (overrides: Record<string, unknown>) =>
  site({ landMotion: { rateMmPerYear: -2, sigmaMmPerYear: 0.5, source: 'gps', epoch: 2020, ...overrides } })
const nested = (depth: number) => `{"name":"Deep","thresholds":${'['.repeat(depth)}${']'.repeat(depth)}}`
/** The text poppler reads from a PDF. */
function pdfText(pdf: Buffer): string {
  const file = join(mkdtempSync(join(tmpdir(), 'bw-hostile-')), 'briefing.pdf')
  writeFileSync(file, pdf)
  return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' })
}

/** A GET with a forged Host header (fetch does not let a caller set Host). */
function getWithHost(url: string, host: string): Promise<{ status: number, body: Buffer }> {
  return new Promise((done, fail) => {
    httpGet(url, { headers: { host } }, (response) => {
      const chunks: Buffer[] = []
      response
        .on('data', (chunk: Buffer) => chunks.push(chunk))
        .on('end', () => done({ status: response.statusCode ?? 0, body: Buffer.concat(chunks) }))
    }).on('error', fail)
  })
}

const resolve = <T>(value: Value<T>, c: Ctx): T => (typeof value === 'function' ? (value as (c: Ctx) => T)(c) : value)

const REFUSALS: Array<[string, Hostile]> = [
  // Bodies that are not what a form sends.
  [
    'malformed JSON',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: '{"name": "Half',
      status: 400,
      message: /^body: The request body is not valid JSON/,
    },
  ],
  [
    'NaN written into the JSON',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: '{"name":"x","latitude":NaN}',
      status: 400,
      message: /^body: The request body is not valid JSON/,
    },
  ],
  [
    'a JSON array instead of an object',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: [site()],
      status: 400,
      message: /^body: Send a JSON object with the fields of this form/,
    },
  ],
  [
    'a bare JSON string',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: 'Hostile Point',
      status: 400,
      message: /^body: Send a JSON object/,
    },
  ],
  [
    'JSON null',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: 'null',
      status: 400,
      message: /^body: Send a JSON object/,
    },
  ],
  [
    'an empty body',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/releases',
      raw: '',
      headers: { 'content-type': 'application/json' },
      status: 400,
      message: /^body: Send a JSON object/,
    },
  ],
  [
    'JSON sent as text/plain',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: JSON.stringify(site()),
      headers: { 'content-type': 'text/plain' },
      status: 415,
      message: /Content-Type: application\/json/,
    },
  ],
  [
    'a form post (urlencoded)',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: 'name=Hostile&latitude=1',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      status: 415,
      message: /Send the body as JSON/,
    },
  ],
  [
    'a multipart upload',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/annual-maxima`,
      raw: '--b\r\nContent-Disposition: form-data; name="csv"\r\n\r\nyear,value\r\n--b--\r\n',
      headers: { 'content-type': 'multipart/form-data; boundary=b' },
      status: 415,
      message: /Send the body as JSON/,
    },
  ],
  [
    'JSON nested 100,000 levels deep',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: nested(100_000),
      status: 400,
      message: /nested more than 32 levels deep/,
    },
  ],
  [
    'a body over 12 MB',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/releases',
      raw: () => JSON.stringify({ ...quantiles(''), csv: '0.1,'.repeat(3_300_000) }),
      status: 413,
      message: /larger than 12 MB.*uploads are limited to 8 MB/,
    },
  ],

  // Text the database cannot hold.
  [
    'a NUL byte in a site name',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ name: 'Quay\u0000Street' }),
      status: 400,
      message: /^name: Remove the NUL character/,
    },
  ],
  [
    'a lone high surrogate in the reference level',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: JSON.stringify(site({ referenceLevel: 'x' })).replace(
        '"referenceLevel":"x"',
        '"referenceLevel":"MSL \\ud800"',
      ),
      status: 400,
      message: /^referenceLevel: The text has a broken character/,
    },
  ],
  [
    'a lone low surrogate in a threshold label',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: JSON.stringify(site()).replace('"label":"Quay"', '"label":"\\udc00Quay"'),
      status: 400,
      message: /^thresholds\.0\.label: The text has a broken character/,
    },
  ],
  [
    'a NUL byte in a field name',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: JSON.stringify(site()).replace('"name"', '"na\\u0000me"'),
      status: 400,
      message: /A field name: Remove the NUL character/,
    },
  ],
  [
    'a NUL byte inside an uploaded CSV',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/releases',
      body: quantiles(withCell('0.2\u0000')),
      status: 400,
      message: /^csv: Remove the NUL character/,
    },
  ],
  [
    'a NUL byte in a briefing title',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/briefings',
      body: (c: Ctx) => ({
        outlookId: c.outlookId,
        title: 'Kelwick\u0000',
        thresholdIds: c.thresholdIds,
        years: [2050],
      }),
      status: 400,
      message: /^title: Remove the NUL character/,
    },
  ],
  [
    'a 10,000-character site name',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ name: 'W'.repeat(10_000) }),
      status: 400,
      message: /^name: Use at most 120 characters/,
    },
  ],
  [
    '4,001 emoji in the local context',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/briefings',
      body: (c: Ctx) => ({
        outlookId: c.outlookId,
        title: 'Long',
        localContext: '🌊'.repeat(4_001),
        thresholdIds: c.thresholdIds,
        years: [2050],
      }),
      status: 400,
      message: /^localContext: Use at most 4000 characters/,
    },
  ],

  // Numbers that are not numbers, or not sensible ones.
  [
    'a latitude sent as a string',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ latitude: '48.1' }),
      status: 400,
      message: /^latitude: Enter the latitude as a number/,
    },
  ],
  [
    'a latitude of 1e309 (Infinity once parsed)',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: JSON.stringify(site()).replace('"latitude":47.7', '"latitude":1e309'),
      status: 400,
      message: /^latitude: Enter the latitude as a number/,
    },
  ],
  [
    'a longitude of -1e309',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      raw: JSON.stringify(site()).replace('"longitude":-34.8', '"longitude":-1e309'),
      status: 400,
      message: /^longitude: Enter the longitude as a number/,
    },
  ],
  [
    'a latitude of true',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ latitude: true }),
      status: 400,
      message: /^latitude: Enter the latitude as a number/,
    },
  ],
  [
    'a threshold a million metres down',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ thresholds: [{ label: 'Pit', height: -1e6 }] }),
      status: 400,
      message: /^thresholds\.0\.height: The height must be at least -5 m/,
    },
  ],
  [
    'a design life given as a string',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ thresholds: [{ label: 'Wall', height: 1, designLifeYears: '30' }] }),
      status: 400,
      message: /^thresholds\.0\.designLifeYears: Enter the design life in whole years/,
    },
  ],
  [
    'a land-motion epoch of 1e20',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: land({ epoch: 1e20 }),
      status: 400,
      message: /^landMotion\.epoch: .*The epoch must be 2100 or earlier/,
    },
  ],
  [
    'a negative number of samples',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/outlooks`,
      body: { scenario: 'SSP2-4.5', samples: -5 },
      status: 400,
      message: /^samples: Use at least 1,000 samples/,
    },
  ],
  [
    'a fractional number of samples',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/outlooks`,
      body: { scenario: 'SSP2-4.5', samples: 1000.5 },
      status: 400,
      message: /^samples: Enter a whole number of samples/,
    },
  ],
  [
    'a seed above 2^53',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/outlooks`,
      body: { scenario: 'SSP2-4.5', seed: 2 ** 53 + 2 },
      status: 400,
      message: /^seed: .*The seed must be below 2,147,483,648/,
    },
  ],
  [
    'briefing years as strings',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/briefings',
      body: (c: Ctx) => ({ outlookId: c.outlookId, title: 'Years', thresholdIds: c.thresholdIds, years: ['2050'] }),
      status: 400,
      message: /^years\.0: Choose whole years from the outlook/,
    },
  ],

  // Shapes that are not what the form sends.
  [
    'thresholds as an object',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ thresholds: { label: 'Quay', height: 1 } }),
      status: 400,
      message: /^thresholds: Send the thresholds as a list/,
    },
  ],
  [
    'land motion as an array',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ landMotion: [-2, 0.5] }),
      status: 400,
      message: /^landMotion: Enter the land motion/,
    },
  ],
  [
    '13 thresholds',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ thresholds: Array.from({ length: 13 }, (_, i) => ({ label: `T${i}`, height: 1 })) }),
      status: 400,
      message: /^thresholds: At most 12 thresholds per site/,
    },
  ],
  [
    'a threshold that is null',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/sites',
      body: site({ thresholds: [null] }),
      status: 400,
      message: /^thresholds\.0: Enter each threshold as \{ label, height \}/,
    },
  ],
  // Adaptation measures, pathways and decision records.
  [
    'a negative lead time',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/measures`,
      body: { name: 'Gate', height: 2, leadTimeYears: -3 },
      status: 400,
      message: /^leadTimeYears: A lead time cannot be negative: enter the years needed/,
    },
  ],
  [
    'a lead time sent as a string',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/measures`,
      body: { name: 'Gate', height: 2, leadTimeYears: '10' },
      status: 400,
      message: /^leadTimeYears: Enter the lead time in whole years/,
    },
  ],
  [
    'a measure below today\'s mean sea level',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/measures`,
      body: { name: 'Sunken wall', height: -0.2, leadTimeYears: 5 },
      status: 400,
      message: /^height: -0\.20 m is at or below mean sea level at the reference epoch 2020/,
    },
  ],
  [
    'a measure height of 1e309',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/measures`,
      raw: '{"name":"Wall","height":1e309,"leadTimeYears":5}',
      status: 400,
      message: /^height: Enter the height the measure protects to/,
    },
  ],
  [
    'a NUL byte in a measure name',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/measures`,
      body: { name: 'Wall\u0000', height: 2, leadTimeYears: 5 },
      status: 400,
      message: /^name: Remove the NUL character/,
    },
  ],
  [
    'a cost band that does not exist',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/measures`,
      body: { name: 'Wall', height: 2, leadTimeYears: 5, costBand: 'free' },
      status: 400,
      message: /^costBand: Choose a cost band/,
    },
  ],
  [
    'a cyclic pathway',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/pathways`,
      body: { name: 'Loop', measureIds: [UUID_A, UUID_B, UUID_A] },
      status: 400,
      message: /^measureIds\.2: This measure is already step 1; a pathway cannot return to an earlier measure/,
    },
  ],
  [
    'a pathway of another site\'s measures',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/pathways`,
      body: { name: 'Elsewhere', measureIds: [UUID_A, UUID_B] },
      status: 400,
      message: /^measureIds\.0: This is not a measure of this site/,
    },
  ],
  [
    'pathway measures as one string',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/pathways`,
      body: { name: 'Str', measureIds: `${UUID_A},${UUID_B}` },
      status: 400,
      message: /^measureIds: List the measures in the order/,
    },
  ],
  [
    'a decision rationale of 10,000 characters',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/decisions`,
      body: {
        pathwayId: UUID_A,
        measureId: UUID_B,
        scenario: 'SSP2-4.5',
        tolerance: 0.1,
        rationale: 'R'.repeat(10_000),
        reviewDate: '2099-01-01',
      },
      status: 400,
      message: /^rationale: Use at most 4000 characters/,
    },
  ],
  [
    'a review date of 30 February',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/decisions`,
      body: {
        pathwayId: UUID_A,
        measureId: UUID_B,
        scenario: 'SSP2-4.5',
        tolerance: 0.1,
        rationale: 'Why',
        reviewDate: '2027-02-30',
      },
      status: 400,
      message: /^reviewDate: Enter a real calendar date/,
    },
  ],
  [
    'a decision on a pathway that does not exist',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/decisions`,
      body: {
        pathwayId: UUID_A,
        measureId: UUID_B,
        scenario: 'SSP2-4.5',
        tolerance: 0.1,
        rationale: 'Why',
        reviewDate: '2099-01-01',
      },
      status: 400,
      message: /^pathwayId: Choose a pathway of this site/,
    },
  ],
  [
    'a new series given as a string',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/releases',
      body: { ...quantiles(withCell('0.2')), series: 'glaciers' },
      status: 400,
      message: /^series: Describe the new series as \{ component, scenario, title \}/,
    },
  ],
  [
    'a DOI given as a number',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/releases',
      body: { ...quantiles(withCell('0.2')), doi: 10.1234 },
      status: 400,
      message: /^doi: Enter a DOI like 10\.1234\/abcd/,
    },
  ],
  [
    'comparison outlooks given as one string',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/briefings',
      body: (c: Ctx) => ({
        outlookId: c.outlookId,
        title: 'Compare',
        thresholdIds: c.thresholdIds,
        years: [2050],
        comparisonOutlookIds: c.outlookId,
      }),
      status: 400,
      message: /^comparisonOutlookIds: Send the outlooks to compare as a list of ids/,
    },
  ],
  [
    'a role that does not exist',
    {
      as: 'admin',
      method: 'POST',
      path: '/api/admin/users',
      body: (c: Ctx) => ({
        email: 'root@hostile.example',
        name: 'Root',
        role: 'superadmin',
        organisationId: c.portId,
        password: 'Hostile-harbour-gauge-9',
      }),
      status: 400,
      message: /^role: Choose one of: /,
    },
  ],
  [
    'disabled sent as the string "false"',
    {
      as: 'admin',
      method: 'PATCH',
      path: '/api/admin/users/00000000-0000-4000-8000-000000000000',
      body: { disabled: 'false' },
      status: 400,
      message: /^disabled: disabled must be true or false/,
    },
  ],
  [
    'an unknown locale',
    {
      as: 'reader',
      method: 'PATCH',
      path: '/api/me',
      body: { locale: 'xx' },
      status: 400,
      message: /^locale: Choose one of: en, es/,
    },
  ],

  // Addresses that try to add mail headers.
  [
    'a reset address carrying a Bcc header',
    {
      as: 'anonymous',
      method: 'POST',
      path: '/api/account/password-reset',
      body: { email: 'a@hostile.example\r\nBcc: everyone@hostile.example' },
      status: 400,
      message: /^email: Enter a valid e-mail address/,
    },
  ],
  [
    'a watch address with a newline',
    {
      as: 'planner',
      method: 'POST',
      path: '/api/watches',
      body: (c: Ctx) => ({ email: 'a@hostile.example\nSubject: hi', siteId: c.targetSiteId }),
      status: 400,
      message: /^email: Enter a valid e-mail address/,
    },
  ],
  [
    'a sign-in address sent as an array',
    {
      as: 'anonymous',
      method: 'POST',
      path: '/api/auth/sign-in',
      body: { email: ['admin@caldwyn.example'], password: 'x' },
      status: 400,
      message: /^email: Enter an e-mail address/,
    },
  ],

  // Ids and parameters that are paths, SQL or not ids at all.
  [
    'an id of ../../etc/passwd (encoded)',
    {
      as: 'planner',
      method: 'GET',
      path: '/api/sites/..%2F..%2Fetc%2Fpasswd',
      status: 404,
      message: /^No such record\.$/,
    },
  ],
  [
    'an id of %2e%2e (sent verbatim)',
    {
      as: 'planner',
      method: 'GET',
      path: '/api/sites/%2e%2e',
      verbatim: true,
      status: 404,
      message: /^No such record\.$/,
    },
  ],
  [
    'a path of /api/sites/../admin/users (sent verbatim)',
    {
      as: 'planner',
      method: 'GET',
      path: '/api/sites/../admin/users',
      verbatim: true,
      status: 404,
      message: /^Page not found/,
    },
  ],
  [
    'an id of ..\\..\\ (encoded backslashes)',
    { as: 'planner', method: 'GET', path: '/api/sites/..%5c..%5cwindows', status: 404, message: /^No such record\.$/ },
  ],
  [
    'an id of 1 OR 1=1',
    {
      as: 'planner',
      method: 'PATCH',
      path: '/api/sites/1%20OR%201%3D1',
      body: site(),
      status: 404,
      message: /^No such record\.$/,
    },
  ],
  [
    'a uuid with a quote and SQL after it',
    {
      as: 'analyst',
      method: 'POST',
      path: c => `/api/releases/${c.draftReleaseId}'%20OR%20'1'='1/submit`,
      status: 404,
      message: /^No such record\.$/,
    },
  ],
  [
    'a share token of ../',
    {
      as: 'anonymous',
      method: 'GET',
      path: '/api/shared/..%2F..%2Fapi%2Fadmin%2Fusers',
      status: 404,
      message: /^No such record\.$/,
    },
  ],
  [
    'a site filter of 1 OR 1=1',
    {
      as: 'planner',
      method: 'GET',
      path: '/api/briefings?siteId=1%20OR%201%3D1',
      status: 400,
      message: /^siteId: siteId must be a site id/,
    },
  ],
  [
    'a component filter with markup',
    {
      as: 'anonymous',
      method: 'GET',
      path: `/api/releases?component=${encodeURIComponent(SCRIPT)}`,
      status: 400,
      message: /^component: Choose one of: /,
    },
  ],
  [
    'a scenario filter with SQL',
    {
      as: 'anonymous',
      method: 'GET',
      path: `/api/releases?scenario=${encodeURIComponent('\' OR 1=1 --')}`,
      status: 400,
      message: /^scenario: Use 2–40 letters/,
    },
  ],
  [
    'a PDF paper size of <script>',
    {
      as: 'planner',
      method: 'GET',
      path: (c: Ctx) => `/api/briefings/${c.briefingId}/pdf?paper=${encodeURIComponent(SCRIPT)}`,
      status: 400,
      message: /^paper: paper must be a4 or letter/,
    },
  ],
  [
    'an audit limit of abc',
    {
      as: 'admin',
      method: 'GET',
      path: '/api/admin/audit?limit=abc',
      status: 400,
      message: /^limit: Use a whole number from 1 to 500/,
    },
  ],
  [
    'an audit limit of 1e9',
    {
      as: 'admin',
      method: 'GET',
      path: '/api/admin/audit?limit=1e9',
      status: 400,
      message: /^limit: Use a whole number from 1 to 500/,
    },
  ],
  [
    'an unsubscribe token given twice',
    {
      as: 'anonymous',
      method: 'POST',
      path: `/api/watches/unsubscribe?token=${'a'.repeat(32)}&token=${'b'.repeat(32)}`,
      status: 400,
      message: /^token: /,
    },
  ],
  [
    'an invitation token with a NUL',
    {
      as: 'anonymous',
      method: 'GET',
      path: `/api/account/invitation?token=${'a'.repeat(30)}%00`,
      status: 400,
      message: /^token: This link is not valid/,
    },
  ],

  // What an organisation adopts: only published series of the right component, from its own page.
  [
    'an adopted series id of SQL',
    {
      as: 'planner',
      method: 'PUT',
      path: c => `/api/organisations/${c.councilId}/adoption`,
      body: { scenario: 'SSP2-4.5', series: { glaciers: 'x\' OR 1=1 --' } },
      status: 400,
      message: /^series\.glaciers: Choose a published series from the list/,
    },
  ],
  [
    'an adopted component with markup',
    {
      as: 'planner',
      method: 'PUT',
      path: c => `/api/organisations/${c.councilId}/adoption`,
      body: (c: Ctx) => ({ scenario: 'SSP2-4.5', series: { [SCRIPT]: c.glaciersSeries } }),
      status: 400,
      message: /^series: Choose components from: /,
    },
  ],
  [
    'a glaciers series adopted for Greenland',
    {
      as: 'planner',
      method: 'PUT',
      path: c => `/api/organisations/${c.councilId}/adoption`,
      body: (c: Ctx) => ({ scenario: 'SSP2-4.5', series: { greenland: c.glaciersSeries } }),
      status: 400,
      message: /^series\.greenland: This series is of glaciers, not greenland/,
    },
  ],
  [
    'adopted series sent as a list',
    {
      as: 'planner',
      method: 'PUT',
      path: c => `/api/organisations/${c.councilId}/adoption`,
      body: (c: Ctx) => ({ scenario: 'SSP2-4.5', series: [c.glaciersSeries] }),
      status: 400,
      message: /^series: Give the series to adopt per component, as/,
    },
  ],
  [
    'correlation sets of an organisation that publishes none',
    {
      as: 'planner',
      method: 'PUT',
      path: c => `/api/organisations/${c.councilId}/adoption`,
      body: (c: Ctx) => ({ scenario: 'SSP2-4.5', correlation: c.portId }),
      status: 400,
      message: /^correlation: That organisation has no published correlation set/,
    },
  ],
  [
    'an adoption with a field no form sends',
    {
      as: 'planner',
      method: 'PUT',
      path: c => `/api/organisations/${c.councilId}/adoption`,
      body: { scenario: 'SSP2-4.5', organisationId: '00000000-0000-4000-8000-000000000000' },
      status: 400,
      message: /^body: Send only scenario, series and correlation \(not organisationId\)/,
    },
  ],
  [
    'an adoption for another organisation',
    {
      as: 'planner',
      method: 'PUT',
      path: c => `/api/organisations/${c.portId}/adoption`,
      body: { scenario: 'SSP2-4.5' },
      status: 404,
      message: /^No such organisation\.$/,
    },
  ],
  [
    'an adoption scenario of markup',
    {
      as: 'planner',
      method: 'PUT',
      path: c => `/api/organisations/${c.councilId}/adoption`,
      body: { scenario: SCRIPT },
      status: 400,
      message: /^scenario: Use 2–40 letters/,
    },
  ],

  // Uploads: formula cells, oversized files.
  [
    'a quantile cell =cmd|…',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/releases',
      body: quantiles(withCell('=cmd|\' /C calc\'!A0')),
      status: 400,
      message: /^csv row 3, column 2100: "=cmd\|' \/C calc'!A0" is not a finite number/,
    },
  ],
  [
    'a quantile cell +2+3+cmd',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/releases',
      body: quantiles(withCell('+2+3+cmd|x')),
      status: 400,
      message: /^csv row 3, column 2100: "\+2\+3\+cmd\|x" is not a finite number/,
    },
  ],
  [
    'a quantile cell -2+3',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/releases',
      body: quantiles(withCell('-2+3')),
      status: 400,
      message: /^csv row 3, column 2100: "-2\+3" is not a finite number/,
    },
  ],
  [
    'a quantile cell @SUM(1+9)',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/releases',
      body: quantiles(withCell('@SUM(1+9)*cmd|x')),
      status: 400,
      message: /^csv row 3, column 2100: "@SUM\(1\+9\)\*cmd\|x" is not a finite number/,
    },
  ],
  [
    'a grid cell =HYPERLINK',
    {
      as: 'analyst',
      method: 'POST',
      path: '/api/scale-factor-grids',
      body: {
        component: 'other',
        title: 'Hostile grid',
        csv: 'latitude,0,10\n0,1,=HYPERLINK("http://x")\n10,1,1\n',
        ...PROVENANCE,
      },
      status: 400,
      message: /^csv row 2, column 10: .* is not a finite number/,
    },
  ],
  [
    'an annual maximum of =1+1',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/annual-maxima`,
      body: { csv: ANNUAL_MAXIMA_CSV.replace('2003,1.55', '2003,=1+1') },
      status: 400,
      message: /^csv row 5, column value: "=1\+1" is not a finite number/,
    },
  ],
  [
    'annual maxima over 1 MB',
    {
      as: 'planner',
      method: 'POST',
      path: c => `/api/sites/${c.targetSiteId}/annual-maxima`,
      body: { csv: `year,value\n${'2001,1.5\n'.repeat(120_000)}` },
      status: 400,
      message: /^csv: The file is larger than 1 MB/,
    },
  ],
]

let server: RunningServer
let smtp: TestSmtp
const clients = {} as Record<As, ApiClient>
const ctx = {} as Ctx

async function signedIn(email: string, password: string) {
  const api = new ApiClient(server.url)
  await api.signIn(email, password)
  return api
}

/** Everything a refusal could have half-written, as the API shows it. */
async function world() {
  const { planner, analyst, admin, reader } = clients
  const reads = await Promise.all([
    planner.get('/api/sites'),
    planner.get(`/api/sites/${ctx.targetSiteId}`),
    planner.get(`/api/sites/${ctx.targetSiteId}/outlooks`),
    planner.get(`/api/sites/${ctx.targetSiteId}/pathways`),
    planner.get('/api/briefings'),
    planner.get('/api/watches'),
    analyst.get('/api/releases'),
    analyst.get('/api/correlation-sets'),
    analyst.get('/api/scale-factor-grids'),
    admin.get('/api/admin/users'),
    admin.get('/api/admin/audit?limit=1'),
    reader.get('/api/me'),
    planner.get(`/api/organisations/${ctx.councilId}/adoption`),
  ])
  const outbox = await admin.get('/api/admin/outbox?limit=500')
  return JSON.stringify([...reads.map(r => r.body), outbox.body.messages.length])
}

beforeAll(async () => {
  smtp = await new TestSmtp().start()
  server = await startServer({ SMTP_URL: smtp.url })
  clients.anonymous = new ApiClient(server.url)
  ;[clients.reader, clients.planner, clients.analyst, clients.admin] = await Promise.all([
    signedIn(READER.email, READER.password),
    signedIn(PLANNER.email, PLANNER.password),
    signedIn(ANALYST.email, ANALYST.password),
    // The operator, who sees every organisation's people, audit and outbox (this file writes to several).
    signedIn(OPERATOR.email, OPERATOR.password),
  ])
  const { planner, analyst, admin } = clients
  ctx.targetSiteId = (await planner.post('/api/sites', SITE_BODY('Hostile target'))).body.id
  ctx.thresholdIds = (await planner.get(`/api/sites/${ctx.targetSiteId}`)).body.thresholds.map(
    (t: { id: string }) => t.id,
  )
  ctx.outlookId = (await planner.post(`/api/sites/${ctx.targetSiteId}/outlooks`, OUTLOOK_REQUEST)).body.id
  ctx.briefingId = (
    await planner.post('/api/briefings', {
      outlookId: ctx.outlookId,
      title: 'Hostile target',
      thresholdIds: ctx.thresholdIds,
      years: [2050],
    })
  ).body.id
  ctx.draftReleaseId = (
    await analyst.post('/api/releases', {
      ...quantiles(withCell('0.2')),
      series: { component: 'other', scenario: 'SSP2-4.5', title: 'Hostile draft' },
    })
  ).body.id
  ctx.portId = (await admin.get('/api/organisations')).body.find((o: { kind: string }) => o.kind === 'port').id
  ctx.councilId = (await planner.get('/api/me')).body.user.organisationId
  ctx.glaciersSeries = (
    await analyst.get('/api/releases?component=glaciers&scenario=SSP2-4.5&state=published')
  ).body[0].seriesId
})
afterAll(async () => {
  await server?.stop()
  await smtp?.stop()
})

describe('hostile input is refused with a message that says what to fix, and nothing is written', () => {
  it('covers at least 40 refusals', () => {
    expect(REFUSALS.length).toBeGreaterThanOrEqual(40)
  })

  it.each(REFUSALS)('%s → refused', async (_name, hostile) => {
    const before = await world()
    const raw = hostile.raw === undefined ? undefined : resolve(hostile.raw, ctx)
    const body = hostile.body === undefined ? undefined : resolve(hostile.body, ctx)
    const client = clients[hostile.as]
    const path = resolve(hostile.path, ctx)
    const response = hostile.verbatim
      ? await client.requestVerbatim(hostile.method, path)
      : await client.request(hostile.method, path, body, {
          rawBody: raw,
          headers: { ...(raw !== undefined ? { 'content-type': 'application/json' } : {}), ...hostile.headers },
        })
    expect(response.status, JSON.stringify(response.body).slice(0, 500)).toBe(hostile.status)
    expect(response.body.message).toMatch(hostile.message)
    expect(await world()).toBe(before)
  })
})

describe('hostile text a person may fairly type is kept as typed and shown escaped', () => {
  const FAIR_TEXT: Array<[string, string]> = [
    ['an image tag with a script handler', IMG],
    ['a script element', SCRIPT],
    ['an SQL injection', 'Robert\'); DROP TABLE sites;--'],
    ['an always-true SQL clause', 'x\' OR \'1\'=\'1'],
    ['right-to-left letters and marks', 'رصيف الميناء \u200FQuay נמל'],
    ['zero-width characters', 'Kel\u200Bwick\u200D\uFEFFquay'],
    ['emoji with joiners', 'Harbour 🌊🏝️ 👩‍👩‍👧 wall'],
    ['combining accents', 'Cafe\u0301 quay'],
    ['a spreadsheet formula', '=cmd|\' /C calc\'!A0'],
    ['exactly 120 characters', 'Ω'.repeat(120)],
  ]

  it.each(FAIR_TEXT)('a site and threshold named with %s round-trip exactly', async (_name, text) => {
    const { planner } = clients
    const created = await planner.post('/api/sites', site({ name: text, thresholds: [{ label: text, height: 1 }] }))
    expect(created.status).toBe(201)
    const read = (await planner.get(`/api/sites/${created.body.id}`)).body
    expect(read.name).toBe(text)
    expect(read.thresholds[0].label).toBe(text)
    expect((await planner.get('/api/sites')).status).toBe(200)
  })

  it('control characters and bidirectional overrides are removed from text fields, so no page, PDF or e-mail carries them', async () => {
    const { planner, analyst } = clients
    const typed = 'Bell\u0007 Quay \u001B[31m\u202Egnp.exe\u202C \u2066wall\u2069\u0085 end'
    const kept = 'Bell Quay [31mgnp.exe wall end'
    const created = await planner.post(
      '/api/sites',
      site({ name: typed, referenceLevel: `Chart datum${typed}`, thresholds: [{ label: typed, height: 1 }] }),
    )
    expect(created.status).toBe(201)
    const read = (await planner.get(`/api/sites/${created.body.id}`)).body
    expect([read.name, read.thresholds[0].label, read.referenceLevel]).toEqual([kept, kept, `Chart datum${kept}`])
    // A release's free text passes the same rule.
    const release = await analyst.post('/api/releases', {
      ...quantiles(withCell('0.2')),
      series: { component: 'glaciers', scenario: 'SSP2-4.5', title: typed },
      method: `Method${typed}`,
      citation: 'Cited (2026).',
    })
    expect(release.status).toBe(201)
    expect((await analyst.get(`/api/releases/${release.body.id}`)).body).toMatchObject({ method: `Method${kept}` })
    // The confirmation e-mail names the site without them.
    expect((await planner.post('/api/watches', { email: PLANNER.email, siteId: created.body.id })).status).toBe(202)
    const mail = await smtp.next(m => isTo(PLANNER.email)(m) && (m.text ?? '').includes(kept))
    // eslint-disable-next-line no-control-regex -- looking for control characters is the point
    expect(`${mail.subject}${mail.text}${mail.html}`).not.toMatch(/[\u0007\u001B\u0085\u202A-\u202E\u2066-\u2069]/)
  })

  it('ignores fields a form does not have: a site cannot be placed in another organisation, a role cannot be self-granted', async () => {
    const { planner, reader } = clients
    const created = await planner.post(
      '/api/sites',
      site({
        name: 'Smuggled',
        organisationId: ctx.portId,
        createdBy: '00000000-0000-4000-8000-000000000000',
        id: '00000000-0000-4000-8000-000000000001',
      }),
    )
    expect(created.status).toBe(201)
    expect(created.body.id).not.toBe('00000000-0000-4000-8000-000000000001')
    const own = (await planner.get('/api/me')).body.user.organisationId
    expect(created.body.organisationId).toBe(own)

    const patched = await reader.patch('/api/me', { locale: 'en', role: 'admin', organisationId: ctx.portId })
    expect(patched.status).toBe(200)
    const me = (await reader.get('/api/me')).body.user
    expect(me).toMatchObject({ role: 'reader', organisationId: expect.not.stringMatching(ctx.portId) })
    expect((await reader.get('/api/admin/users')).status).toBe(403)
  })

  describe('markup in names comes back escaped in the page, the PDF and the e-mail', () => {
    let siteId: string
    let outlookId: string
    let briefingId: string
    let shareToken: string
    let releaseId: string

    beforeAll(async () => {
      const { planner, analyst } = clients
      siteId = (await planner.post('/api/sites', site({ name: IMG, thresholds: [{ label: SCRIPT, height: 0.5 }] })))
        .body.id
      const thresholdIds = (await planner.get(`/api/sites/${siteId}`)).body.thresholds.map((t: { id: string }) => t.id)
      outlookId = (await planner.post(`/api/sites/${siteId}/outlooks`, OUTLOOK_REQUEST)).body.id
      const briefing = { outlookId, title: IMG, localContext: SCRIPT, audience: IMG, thresholdIds, years: [2050, 2100] }
      const draft = await planner.post('/api/briefings', briefing)
      expect(draft.status).toBe(201)
      briefingId = draft.body.id
      const shared = (await planner.post('/api/briefings', briefing)).body.id
      expect((await planner.post(`/api/briefings/${shared}/issue`)).status).toBe(200)
      shareToken = (await planner.post(`/api/briefings/${shared}/share`)).body.shareToken
      const release = await analyst.post('/api/releases', {
        ...quantiles(withCell('0.2')),
        series: { component: 'antarctica', scenario: 'SSP2-4.5', title: IMG },
        method: SCRIPT,
        citation: IMG,
      })
      expect(release.status).toBe(201)
      releaseId = release.body.id
    })

    it.each([
      ['the site page', 'planner', () => `/sites/${siteId}`],
      ['the outlook page', 'planner', () => `/sites/${siteId}/outlooks/${outlookId}`],
      ['the briefing page', 'planner', () => `/briefings/${briefingId}`],
      ['the shared briefing page, signed out', 'anonymous', () => `/shared/${shareToken}`],
      ['the release page', 'analyst', () => `/library/releases/${releaseId}`],
    ] as const)('%s renders the names as text, never as markup', async (_name, as, path) => {
      const response = await clients[as].fetchRaw(path())
      expect(response.status).toBe(200)
      const html = await response.text()
      expect(html).toContain('&lt;img src=x onerror=alert(1)&gt;')
      expect(html).not.toContain(IMG)
      expect(html).not.toContain(SCRIPT)
    })

    it('the briefing PDF prints the names as plain text', async () => {
      const response = await clients.planner.fetchRaw(`/api/briefings/${briefingId}/pdf`)
      expect(response.status).toBe(200)
      const text = pdfText(Buffer.from(await response.arrayBuffer()))
      expect(text).toContain(IMG)
      expect(text).toContain(SCRIPT)
    })

    it('the watch e-mail escapes the site name in its HTML part', async () => {
      const response = await clients.planner.post('/api/watches', { email: PLANNER.email, siteId })
      expect(response.status).toBe(202)
      const mail = await smtp.next(m => isTo(PLANNER.email)(m) && (m.subject ?? '').includes(IMG))
      expect(mail.html).toContain('&lt;img src=x onerror=alert(1)&gt;')
      expect(mail.html).not.toContain(IMG)
      expect(mail.text).toContain(IMG)
    })

    it('a forged Host header does not put its own link into the shared PDF', async () => {
      const pdf = await getWithHost(`${server.url}/api/shared/${shareToken}/pdf`, 'forged.example')
      expect(pdf.status).toBe(200)
      const text = pdfText(pdf.body)
      expect(text).not.toContain('forged.example')
      expect(text).toContain(`${server.url}/shared/${shareToken}`)
    })

    it('a forged Host header does not put its own link into the shared page', async () => {
      const page = await getWithHost(`${server.url}/shared/${shareToken}`, 'forged.example')
      expect(page.status).toBe(200)
      const html = page.body.toString('utf8')
      expect(html).not.toContain('forged.example')
      expect(html).toContain(`${server.url}/shared/${shareToken}`)
    })
  })

  it('exports neutralise formula cells: a threshold label =cmd|… is written with a leading quote', async () => {
    const { planner } = clients
    const label = '=cmd|\' /C calc\'!A0'
    const created = (
      await planner.post(
        '/api/sites',
        site({
          name: 'Formula quay',
          thresholds: [
            { label, height: 1 },
            { label: '@SUM(1+1)', height: 2 },
            { label: '+1+1', height: 3 },
            { label: '-1+1', height: 4 },
          ],
        }),
      )
    ).body
    const stored = (await planner.get(`/api/sites/${created.id}`)).body.thresholds as {
      label: string
      height: number
    }[]
    const csv = toCsv([['threshold', 'height'], ...stored.map(t => [t.label, t.height])])
    const cells = csv.trim().split('\r\n').slice(1).map(line => line.split(',')[0]!)
    expect(cells).toEqual(['\'=cmd|\' /C calc\'!A0', '\'@SUM(1+1)', '\'+1+1', '\'-1+1'])
  })

  it('the outlook CSV export quotes every formula cell a planner typed (site name and threshold labels)', async () => {
    const { planner } = clients
    const hostile = ['=cmd|\' /C calc\'!A0', '@SUM(1+1)', '+1+1', '-1+1']
    const created = (
      await planner.post(
        '/api/sites',
        site({
          name: '=HYPERLINK("http://example.invalid")',
          thresholds: hostile.map((label, i) => ({ label, height: 1 + i })),
        }),
      )
    ).body
    const outlook = (await planner.post(`/api/sites/${created.id}/outlooks`, { scenario: 'SSP2-4.5', samples: 2000 }))
      .body
    const response = await planner.fetchRaw(`/api/outlooks/${outlook.id}/csv`)
    expect(response.status).toBe(200)
    const text = await response.text()
    expect(text).toContain('site,"\'=HYPERLINK(""http://example.invalid"")"')
    for (const label of hostile) expect(text, label).toContain(`\r\n'${label}`)
    // No line starts a cell with a formula character unquoted.
    for (const line of text.split('\r\n')) expect(line, line).not.toMatch(/^[=+@\t]|,[=+@\t]/)
  })

  it('the release CSV export holds only numbers and year headers, with negative values left as numbers', async () => {
    const { analyst } = clients
    const draft = await analyst.post('/api/releases', {
      ...quantiles('level,2050,2100\n0.17,-0.02,0.1\n0.5,0.01,0.2\n0.83,0.03,0.4\n'),
      series: { component: 'land-water', scenario: 'SSP2-4.5', title: 'Negative export' },
    })
    expect(draft.status).toBe(201)
    const response = await analyst.fetchRaw(`/api/releases/${draft.body.id}/csv`)
    expect(response.headers.get('content-type')).toMatch(/^text\/csv/)
    const cells = (await response.text()).trim().split('\r\n').flatMap(line => line.split(','))
    expect(cells).toContain('-0.02')
    for (const cell of cells) expect(cell === 'level' || Number.isFinite(Number(cell)), cell).toBe(true)
  })
})
