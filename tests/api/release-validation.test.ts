import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'

let server: RunningServer
let analyst: ApiClient
let existingSeriesId: string

const provenance = { method: 'Test method.', citation: 'Test (2026).', licence: 'CC BY 4.0' }
const newSeries = { series: { component: 'glaciers', scenario: 'SSP2-4.5', title: 'Validation test' } }
const quantiles = (csv: string) => ({ ...newSeries, form: 'quantiles', baselineYear: 2020, csv, ...provenance })
const normal = (fields: Record<string, unknown>) => ({
  ...newSeries,
  form: 'normal',
  baselineYear: 2020,
  anchorYears: [2050, 2100],
  mean: [0.1, 0.2],
  sd: [0.01, 0.02],
  ...provenance,
  ...fields,
})
const correlation = (matrix: number[][]) => ({
  scenario: 'SSP2-4.5',
  title: 'Test set',
  components: ['glaciers', 'greenland', 'antarctica'],
  matrix,
  ...provenance,
})
const grid = (csv: string) => ({ component: 'greenland', title: 'Test grid', csv, ...provenance })

async function everything() {
  const [releases, sets, grids] = await Promise.all([
    analyst.get('/api/releases'),
    analyst.get('/api/correlation-sets'),
    analyst.get('/api/scale-factor-grids'),
  ])
  return JSON.stringify([releases.body, sets.body, grids.body])
}

beforeAll(async () => {
  server = await startServer()
  analyst = new ApiClient(server.url)
  await analyst.signIn(ANALYST.email, ANALYST.password)
  const [any] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP2-4.5')).body
  existingSeriesId = any.seriesId
})
afterAll(async () => { await server?.stop() })

// Each malformed upload or form: the route, the body, and what the message must say.
const CASES: Array<[string, string, unknown, RegExp]> = [
  [
    'non-monotone quantiles',
    '/api/releases',
    quantiles('level,2100\n0.17,0.3\n0.5,0.2\n0.83,0.4\n'),
    /values\[0\]: must be non-decreasing across levels/,
  ],
  [
    'a level outside (0,1)',
    '/api/releases',
    quantiles('level,2100\n0,0.1\n0.5,0.2\n0.83,0.4\n'),
    /levels: must be strictly increasing in \(0,1\): 0 is outside/,
  ],
  [
    'levels out of order',
    '/api/releases',
    quantiles('level,2100\n0.5,0.1\n0.17,0.2\n0.83,0.4\n'),
    /levels: must be strictly increasing in \(0,1\): 0.17 follows 0.5/,
  ],
  [
    'fewer than three levels',
    '/api/releases',
    quantiles('level,2100\n0.17,0.1\n0.83,0.4\n'),
    /levels: needs at least 3 probability levels/,
  ],
  [
    'a non-numeric cell',
    '/api/releases',
    quantiles('level,2050,2100\n0.17,0.1,0.2\n0.5,0.2,lots\n0.83,0.3,0.5\n'),
    /csv row 3, column 2100: "lots" is not a finite number/,
  ],
  [
    'a NaN cell',
    '/api/releases',
    quantiles('level,2100\n0.17,NaN\n0.5,0.2\n0.83,0.4\n'),
    /csv row 2, column 2100: "NaN" is not a finite number/,
  ],
  [
    'an infinite cell',
    '/api/releases',
    quantiles('level,2100\n0.17,0.1\n0.5,0.2\n0.83,-Infinity\n'),
    /csv row 4, column 2100: "-Infinity" is not a finite number/,
  ],
  [
    'a wrong header',
    '/api/releases',
    quantiles('probability,2100\n0.17,0.1\n0.5,0.2\n0.83,0.4\n'),
    /csv header: The first column must be headed "level"/,
  ],
  [
    'a header that is not a year',
    '/api/releases',
    quantiles('level,next century\n0.17,0.1\n0.5,0.2\n0.83,0.4\n'),
    /csv header: Column 1 is "next century"/,
  ],
  [
    'years out of order in the header',
    '/api/releases',
    quantiles('level,2100,2050\n0.17,0.1,0.1\n0.5,0.2,0.2\n0.83,0.4,0.4\n'),
    /Years must increase from left to right: 2050 follows 2100/,
  ],
  [
    'a ragged row',
    '/api/releases',
    quantiles('level,2050,2100\n0.17,0.1\n0.5,0.2,0.3\n0.83,0.4,0.5\n'),
    /csv row 2: Has 2 cells but the header has 3/,
  ],
  [
    'too many draws',
    '/api/releases',
    { ...newSeries, form: 'samples', baselineYear: 2020, csv: `2100\n${'0.1\n'.repeat(100_001)}`, ...provenance },
    /At most 100,000 draws, got 100,001/,
  ],
  [
    'a file over the size limit',
    '/api/releases',
    {
      ...newSeries,
      form: 'samples',
      baselineYear: 2020,
      csv: `2100\n${'0.123456789\n'.repeat(800_000)}`,
      ...provenance,
    },
    /larger than 8 MB/,
  ],
  [
    'a missing baseline year',
    '/api/releases',
    normal({ baselineYear: undefined }),
    /baselineYear: Enter the baseline year/,
  ],
  [
    'anchor years out of order',
    '/api/releases',
    normal({ anchorYears: [2100, 2050] }),
    /anchorYears: anchor years must be strictly increasing: 2050 follows 2100/,
  ],
  [
    'an anchor year at the baseline',
    '/api/releases',
    normal({ anchorYears: [2020, 2100] }),
    /first anchor year 2020 must come after the release's baseline year 2020/,
  ],
  [
    'a mean missing for an anchor year',
    '/api/releases',
    normal({ mean: [0.1] }),
    /mean: needs one entry per anchor year \(2\), got 1/,
  ],
  ['a negative sd', '/api/releases', normal({ sd: [-0.01, 0.02] }), /sd\[0\]: must be zero or more/],
  ['a blank number (null in JSON)', '/api/releases', normal({ mean: [null, 0.2] }), /mean\.0: Enter a number/],
  ['no method statement', '/api/releases', normal({ method: '  ' }), /method: Enter the method statement/],
  [
    'an unknown component',
    '/api/releases',
    normal({ series: { component: 'icebergs', scenario: 'SSP2-4.5', title: 'x' } }),
    /series\.component: Choose one of: ocean-expansion/,
  ],
  [
    'both a series and a series id',
    '/api/releases',
    normal({ seriesId: '00000000-0000-4000-8000-000000000000' }),
    /seriesId: Send either seriesId/,
  ],
  [
    'lognormal parameters in gigatonnes',
    '/api/releases',
    {
      ...newSeries,
      form: 'lognormal',
      unit: 'Gt',
      baselineYear: 2020,
      anchorYears: [2100],
      shift: [0],
      mu: [-2],
      sigma: [0.4],
      ...provenance,
    },
    /unit: Enter lognormal parameters in metres/,
  ],
  [
    'a CSV for a normal release',
    '/api/releases',
    normal({ csv: '2100\n0.1\n' }),
    /csv: CSV upload is for quantile tables and draws/,
  ],
  ['a malformed DOI', '/api/releases', normal({ doi: 'doi:abc' }), /doi: Enter a DOI like 10\.1234\/abcd/],
  [
    'a correlation matrix that is not symmetric',
    '/api/correlation-sets',
    correlation([
      [1, 0.5, 0],
      [0.2, 1, 0],
      [0, 0, 1],
    ]),
    /matrix\[0\]\[1\]: not symmetric/,
  ],
  [
    'a correlation matrix without a unit diagonal',
    '/api/correlation-sets',
    correlation([
      [1, 0, 0],
      [0, 0.9, 0],
      [0, 0, 1],
    ]),
    /matrix\[1\]\[1\]: diagonal must be 1/,
  ],
  [
    'a correlation matrix that is not positive semi-definite',
    '/api/correlation-sets',
    correlation([
      [1, 0.9, -0.9],
      [0.9, 1, 0.9],
      [-0.9, 0.9, 1],
    ]),
    /matrix: not positive semi-definite/,
  ],
  [
    'a correlation matrix of the wrong size',
    '/api/correlation-sets',
    correlation([
      [1, 0],
      [0, 1],
    ]),
    /matrix: must be 3×3/,
  ],
  [
    'a correlation set naming a component twice',
    '/api/correlation-sets',
    {
      ...correlation([
        [1, 0],
        [0, 1],
      ]),
      components: ['glaciers', 'glaciers'],
    },
    /components: Each component may appear only once/,
  ],
  [
    'a grid latitude beyond the pole',
    '/api/scale-factor-grids',
    grid('latitude,0,10\n80,1,1\n95,1,1\n'),
    /latitudes\[1\]: Must lie between -90 and 90/,
  ],
  [
    'a grid with a ragged row',
    '/api/scale-factor-grids',
    grid('latitude,0,10\n0,1,1\n10,1\n'),
    /csv row 3: Has 2 cells but the header has 3/,
  ],
  ['malformed JSON', '/api/releases', '{"form": "normal", ', /body: The request body is not valid JSON/],
]

describe('malformed uploads and forms', () => {
  it.each(CASES)(
    'refuses %s with a message naming the problem, and saves nothing',
    async (_name, route, body, message) => {
      const before = await everything()
      const response
        = typeof body === 'string'
          ? await analyst.request('POST', route, undefined, { rawBody: body })
          : await analyst.post(route, body)
      expect(response.status).toBe(400)
      expect(response.body.message).toMatch(message)
      expect(await everything()).toBe(before)
    },
  )

  it('refuses a duplicate version of an existing series', async () => {
    const before = await everything()
    const response = await analyst.post('/api/releases', {
      seriesId: existingSeriesId,
      version: 1,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2100],
      mean: [0.1],
      sd: [0.01],
      ...provenance,
    })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(/version: Version 1 already exists in this series; the next version is 2/)
    expect(await everything()).toBe(before)
  })

  it('refuses a body over the request limit with 413 before reading it', async () => {
    const response = await analyst.request('POST', '/api/releases', undefined, {
      rawBody: `{"csv":"${'x'.repeat(13 * 1024 * 1024)}"}`,
    })
    expect(response.status).toBe(413)
    expect(response.body.message).toMatch(/larger than 12 MB/)
  })

  it('accepts a grid with implausible factors but warns about them', async () => {
    const response = await analyst.post('/api/scale-factor-grids', grid('latitude,0,10\n0,4,4\n10,4,4\n'))
    expect(response.status).toBe(201)
    expect(response.body.warnings.join(' ')).toMatch(/outside -1…2/)
  })
})
