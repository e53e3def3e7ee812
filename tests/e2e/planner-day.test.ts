import { beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { ANALYST, PLANNER, READER, demoUser } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'
import { ApiClient } from '../support/client'
import { SCENARIO_COLOURS } from '../../shared/charts/scenario-colours'
import { formatChance } from '../../shared/wording/chance'

// A planner's day: headlines under the site's planning scenario, named, on the list and the map;
// a briefing that newer science has overtaken says so and is renewed in one click; scenario
// colours that stay put; refusals in plain words; exports that download.

const suite = useBrowserSuite('planner-day')
let page: Page
beforeEach(() => ({ page } = suite))

const REVIEWER = demoUser('reviewer@saltglass.example')
/** Text as a reader sees it: no-break spaces and line breaks are just spaces. */
const plain = (text: string | null) => (text ?? '').replace(/[\s\u00A0\u202F]+/g, ' ').trim()
const mapReady = () => page.waitForSelector('[data-testid="site-map"][data-map-ready="true"]')
/** Axe's "region" rule (moderate, so not in the serious scan): all content inside landmarks. */
async function outsideLandmarks(on: Page) {
  const source = await (await import('node:fs/promises')).readFile(require.resolve('axe-core/axe.min.js'), 'utf8')
  await on.evaluate(source)
  return on.evaluate(async () => {
    const axe = (
      window as unknown as {
        axe: { run: (ctx: Document, opts: object) => Promise<{ violations: { nodes: { target: string[] }[] }[] }> }
      }
    ).axe
    const result = await axe.run(document, { runOnly: ['region'] })
    return result.violations.flatMap(v => v.nodes.map(n => n.target.join(' ')))
  })
}
/** Both widths the product is checked at: a phone and a laptop. */
async function atBothWidths(on: Page, name: string) {
  for (const width of [390, 1366]) {
    await on.setViewportSize({ width, height: 900 })
    await screenshot(on, `planner-day-${name}-${width}`)
  }
}

let api: ApiClient
let kelwick: string
let moderate: string
let briefingId: string
let shareToken: string

beforeAll(async () => {
  api = await ApiClient.signedIn(suite.server.url, PLANNER.email, PLANNER.password)
  kelwick = (await api.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick').id
  const run = async (scenario: string) =>
    (await api.post(`/api/sites/${kelwick}/outlooks`, { scenario, samples: 20_000, seed: 5 })).body.id as string
  moderate = await run('SSP2-4.5')
  // The higher scenario runs last; the list must still speak of the planning scenario.
  await run('SSP5-8.5')
  const thresholdIds = (await api.get(`/api/sites/${kelwick}`)).body.thresholds.map((t: { id: string }) => t.id)
  briefingId = (
    await api.post('/api/briefings', {
      outlookId: moderate,
      title: 'Kelwick: the sea to 2100',
      thresholdIds,
      years: [2050, 2100],
    })
  ).body.id
  expect((await api.post(`/api/briefings/${briefingId}/issue`)).status).toBe(200)
  shareToken = (await api.post(`/api/briefings/${briefingId}/share`)).body.shareToken
}, 120_000)

describe('the planning scenario on the list and the map', () => {
  it('shows each headline under the planning scenario, named, and follows the scenario the planners choose', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    await open(page, '/sites')
    await mapReady()
    const row = page.getByTestId('site-row-Kelwick')
    expect(plain(await row.getByTestId('site-planning-scenario').textContent())).toBe('SSP2-4.5, the planning scenario')
    const headline = (await api.get(`/api/outlooks/${moderate}`)).body.headline
    expect(plain(await row.getByTestId('site-headline').textContent())).toBe(
      plain(`${formatChance(headline.probability, 'en')} by 2100 for High-tide flooding of Quay Street`),
    )
    // The marker carries the same chance, and names the scenario for screen readers and on hover.
    const marker = page.getByTestId('map-marker-Kelwick')
    expect(plain(await marker.locator('.bw-map-figure').textContent())).toBe(
      plain(formatChance(headline.probability, 'en')),
    )
    expect(await marker.getAttribute('title')).toMatch(/\(SSP2-4\.5, the planning scenario\)$/)
    expect(plain(await page.getByTestId('site-row-Drumhaven').getByTestId('site-headline').textContent())).toBe(
      'No outlook yet',
    )
    expect(await seriousAxeViolations(page)).toEqual([])
    expect(await outsideLandmarks(page), 'content outside the landmarks').toEqual([])
    await atBothWidths(page, 'sites')

    // The planners switch the site to SSP5-8.5 in its form; the list follows.
    await page.setViewportSize({ width: 1280, height: 860 })
    await open(page, `/sites/${kelwick}/edit`)
    await page.getByLabel('Planning scenario').selectOption('SSP5-8.5')
    await page.getByLabel('Tolerance').selectOption({ label: '5 %' })
    await atBothWidths(page, 'site-form-planning')
    await page.getByTestId('save-site').click()
    await page.waitForURL(`**/sites/${kelwick}`)
    expect(plain(await page.getByTestId('site-planning-details').textContent())).toBe('SSP5-8.5; tolerance 5 %')
    await open(page, '/sites')
    expect(plain(await page.getByTestId('site-row-Kelwick').getByTestId('site-planning-scenario').textContent())).toBe(
      'SSP5-8.5, the planning scenario',
    )
    const high = (await api.get('/api/sites')).body.find((s: { id: string }) => s.id === kelwick).planningOutlook
    expect(high.scenario).toBe('SSP5-8.5')
    expect(plain(await page.getByTestId('site-row-Kelwick').getByTestId('site-headline').textContent())).toBe(
      plain(`${formatChance(high.headline.probability, 'en')} by 2100 for High-tide flooding of Quay Street`),
    )
    // Back to the default for the other tests.
    const site = (await api.get(`/api/sites/${kelwick}`)).body
    await page.request.patch(`/api/sites/${kelwick}`, {
      data: { ...siteBody(site), planning: { scenario: 'SSP2-4.5', tolerance: 0.1 } },
    })
  })
})

describe('exports', () => {
  it('offers the outlook as CSV and the sites as GeoJSON, and both download', async () => {
    await signIn(page, READER.email, READER.password)
    await open(page, `/sites/${kelwick}/outlooks/${moderate}`)
    const csvLink = page.getByTestId('download-outlook-csv')
    expect(await csvLink.getAttribute('href')).toBe(`/api/outlooks/${moderate}/csv`)
    const [csv] = await Promise.all([page.waitForEvent('download'), csvLink.click()])
    expect(csv.suggestedFilename()).toMatch(/^brinkwater-kelwick-ssp2-4\.5-[0-9a-f]{8}\.csv$/)
    expect(await seriousAxeViolations(page)).toEqual([])
    await page.setViewportSize({ width: 390, height: 900 })
    await screenshot(page, 'planner-day-outlook-export-390')
    await page.setViewportSize({ width: 1280, height: 860 })
    await open(page, '/sites')
    const [geojson] = await Promise.all([
      page.waitForEvent('download'),
      page.getByTestId('download-sites-geojson').click(),
    ])
    expect(geojson.suggestedFilename()).toBe('brinkwater-sites.geojson')
    const body = JSON.parse(await (await import('node:fs/promises')).readFile((await geojson.path())!, 'utf8'))
    expect(body.type).toBe('FeatureCollection')
    expect(body.features.find((f: { id: string }) => f.id === kelwick).geometry.coordinates).toEqual([-34.93, 47.62])
  })
})

describe('a briefing that newer science has overtaken', () => {
  it('says what changed on its page and its shared link, and one click drafts a new version from the latest outlooks', async () => {
    // An analyst publishes a much larger glaciers contribution; the site is computed again.
    const analyst = await ApiClient.signedIn(suite.server.url, ANALYST.email, ANALYST.password)
    const reviewer = await ApiClient.signedIn(suite.server.url, REVIEWER.email, REVIEWER.password)
    const [current] = (await analyst.get('/api/releases?component=glaciers&scenario=SSP2-4.5&state=published')).body
    const draft = await analyst.post('/api/releases', {
      seriesId: current.seriesId,
      form: 'normal',
      baselineYear: 2020,
      anchorYears: [2050, 2100, 2150],
      mean: [0.15, 0.45, 0.6],
      sd: [0.01, 0.03, 0.04],
      method: 'm',
      citation: 'Glaciers revised (browser test)',
      licence: 'l',
    })
    await analyst.post(`/api/releases/${draft.body.id}/submit`)
    expect((await reviewer.post(`/api/releases/${draft.body.id}/approve`)).status).toBe(200)
    await expect
      .poll(async () => (await api.get(`/api/briefings/${briefingId}`)).body.staleness, { timeout: 60_000 })
      .not.toBeNull()

    // Signed out, the shared link says it plainly.
    await open(page, `/shared/${shareToken}`)
    const sharedNotice = page.getByTestId('briefing-stale')
    expect(plain(await sharedNotice.getByRole('heading').textContent())).toBe(
      'Newer outlooks have changed numbers in this briefing',
    )
    expect(plain(await sharedNotice.getByTestId('briefing-stale-changes').textContent())).toMatch(
      /SSP2-4\.5, chance mean sea level is above “High-tide flooding of Quay Street” by 2050: (\d+|less than 1|more than 99) % now, (\d+|less than 1|more than 99) % in this briefing\./,
    )
    expect(await sharedNotice.getByTestId('new-version-latest').count()).toBe(0)
    expect(await seriousAxeViolations(page)).toEqual([])
    await atBothWidths(page, 'shared-stale')

    page = await suite.freshContext()
    await signIn(page, PLANNER.email, PLANNER.password)
    await open(page, `/briefings/${briefingId}`)
    const notice = page.getByTestId('briefing-stale')
    const change = (await api.get(`/api/briefings/${briefingId}`)).body.staleness.changes.find(
      (c: { threshold: string, year: number }) =>
        c.year === 2050 && c.threshold === 'High-tide flooding of Quay Street',
    )
    expect(plain(await notice.textContent())).toContain(
      plain(`${formatChance(change.now, 'en')} now, ${formatChance(change.was, 'en')} in this briefing.`),
    )
    expect(await seriousAxeViolations(page)).toEqual([])
    expect(await outsideLandmarks(page), 'content outside the landmarks').toEqual([])
    await atBothWidths(page, 'briefing-stale')
    await page.setViewportSize({ width: 1280, height: 860 })
    await notice.getByTestId('new-version-latest').click()
    await page.waitForURL(
      url => /^\/briefings\/[0-9a-f-]{36}\/edit$/.test(url.pathname) && !url.pathname.includes(briefingId),
    )
    const newId = page.url().split('/').at(-2)!
    const created = (await api.get(`/api/briefings/${newId}`)).body
    expect(created).toMatchObject({ state: 'draft', version: 2, previousId: briefingId, staleness: null })
    const latest = (await api.get(`/api/sites/${kelwick}/outlooks`)).body.find(
      (o: { scenario: string, seed: number, state: string }) =>
        o.scenario === 'SSP2-4.5' && o.seed === 5 && o.state === 'done',
    )
    expect(created.outlookIds).toEqual([latest.id])
  })
})

describe('scenario colours', () => {
  it('keep one colour per scenario on the comparison charts, whichever outlook the page starts from', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const outlooks = (await api.get(`/api/sites/${kelwick}/outlooks`)).body as {
      id: string
      scenario: string
      state: string
    }[]
    const strokes = async (id: string) => {
      await open(page, `/sites/${kelwick}/outlooks/${id}`)
      const compare = page.getByTestId('compare')
      for (const box of await compare.getByRole('checkbox').all()) if (!(await box.isChecked())) await box.check()
      // Both scenarios' lines are drawn (SVG renderer: the colour is the path's stroke).
      for (const colour of [SCENARIO_COLOURS['SSP2-4.5'], SCENARIO_COLOURS['SSP5-8.5']]) {
        await page.waitForSelector(`[data-testid="compare"] svg path[stroke="${colour}"]`, { state: 'attached' })
      }
      // The solid median lines' colours, by legend order (each scenario's label).
      return compare
        .locator('svg')
        .first()
        .evaluate(svg =>
          [...svg.querySelectorAll('path')]
            .map(path => path.getAttribute('stroke'))
            .filter((stroke): stroke is string => !!stroke && stroke.startsWith('#'))
            .map(s => s.toLowerCase()),
        )
    }
    const fromModerate = await strokes(outlooks.find(o => o.scenario === 'SSP2-4.5' && o.state === 'done')!.id)
    const fromHigh = await strokes(outlooks.find(o => o.scenario === 'SSP5-8.5' && o.state === 'done')!.id)
    for (const drawn of [fromModerate, fromHigh]) {
      expect(drawn).toContain(SCENARIO_COLOURS['SSP2-4.5'])
      expect(drawn).toContain(SCENARIO_COLOURS['SSP5-8.5'])
    }
    await atBothWidths(page, 'compare-colours')
  })
})

describe('refusals', () => {
  it('a reader on a planner\'s page gets a 403 page without content security policy errors, inside the landmarks', async () => {
    await signIn(page, READER.email, READER.password)
    for (const path of ['/sites/new', '/admin/users']) {
      const response = await open(page, path)
      expect(response?.status()).toBe(403)
      expect(plain(await page.textContent('main'))).toMatch(/does not give access/)
      expect(await outsideLandmarks(page), `content outside the landmarks on ${path}`).toEqual([])
    }
    await atBothWidths(page, 'forbidden')
    // The suite fails the test on any CSP violation; none may have happened by now either.
    expect(suite.cspViolations).toEqual([])
  })

  it('an API 403 reads as the role it needs, not "Server Error"', async () => {
    await signIn(page, READER.email, READER.password)
    const response = await page.request.post('/api/sites', { data: {}, headers: { origin: suite.server.url } })
    expect(response.status()).toBe(403)
    const body = await response.json() as { message: string, statusMessage?: string }
    expect(body.message).toBe('This needs the planner role.')
    expect(body.statusMessage ?? '').not.toMatch(/Server Error/)
  })
})

describe('the overview', () => {
  it('opens on what is waiting: each site without a planning outlook, with a link that deals with it', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    await open(page, '/')
    const waiting = page.getByTestId('attention')
    await waiting.getByRole('heading', { name: 'Waiting for you' }).waitFor()
    const text = plain(await waiting.textContent())
    expect(text).toMatch(/Drumhaven has no outlook under its planning scenario, SSP2-4\.5/)
    expect(text).not.toMatch(/Kelwick has no outlook/)
    expect(await seriousAxeViolations(page)).toEqual([])
    await atBothWidths(page, 'overview')
    await page.setViewportSize({ width: 1280, height: 860 })
    await waiting.getByRole('listitem').filter({ hasText: 'Drumhaven' }).getByRole('link', { name: 'Run an outlook' }).click()
    await page.waitForURL(/\/sites\/[\w-]+$/)
    await page.getByRole('heading', { level: 1, name: 'Drumhaven' }).waitFor()
  })
})

/** A site as the API returns it, back into the body PATCH takes. */
function siteBody(site: Record<string, any>) {
  return {
    name: site.name,
    latitude: site.latitude,
    longitude: site.longitude,
    referenceLevel: site.referenceLevel,
    datum: { kind: site.datumKind, offset: site.datumOffset },
    referenceEpoch: site.referenceEpoch,
    landMotion: {
      rateMmPerYear: site.landMotionRate,
      sigmaMmPerYear: site.landMotionSigma,
      source: site.landMotionSource,
      reference: site.landMotionReference,
      epoch: site.landMotionEpoch,
    },
    thresholds: site.thresholds.map((t: Record<string, unknown>) => ({
      label: t.label,
      height: t.height,
      kind: t.kind,
      buildYear: t.buildYear,
      designLifeYears: t.designLifeYears,
    })),
  }
}
