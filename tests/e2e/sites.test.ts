import { beforeEach, describe, expect, it } from 'vitest'
import { PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

const suite = useBrowserSuite('sites')
let page: Page
beforeEach(() => ({ page } = suite))

const nav = () => page.getByTestId('main-nav')
// Steps worth looking at by eye, kept only when every screenshot is asked for.
const snap = (name: string) =>
  process.env.BRINKWATER_SCREENSHOTS === 'all' ? screenshot(page, `sites-step-${name}`) : undefined
const noAxeFaults = async (where: string) => expect(await seriousAxeViolations(page), where).toEqual([])
/** The map has drawn its style (land, island, label font), so a click on it lands on a real map. */
const mapReady = () => page.waitForSelector('[data-testid="site-map"][data-map-ready="true"]')
const sentences = () => page.getByTestId('headline-sentence').allTextContents()
const REFERENCE = 'mean sea level 2020 at the test gauge (illustrative)'

describe('a planner at work on the map and the outlook page', () => {
  it('places a site on the map, enters land motion and a threshold, runs an outlook and reads it in feet and in Spanish', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    await nav().getByRole('link', { name: 'Sites' }).click()
    await page.waitForURL('**/sites')
    await mapReady()
    expect(await page.getByTestId('site-table').locator('tbody tr').count()).toBe(5)
    // The map drew its style with its worker, its own font and canvas under the content security policy.
    expect(suite.cspViolations, 'content security policy violations on the map page').toEqual([])
    await noAxeFaults('sites page')
    await snap('map')

    // Searching narrows the table (and the markers) by name.
    await page.getByLabel('Find a site by name').fill('kel')
    await expect.poll(() => page.getByTestId('site-table').locator('tbody th').allTextContents()).toEqual(['Kelwick'])
    expect(await page.getByTestId('site-map').getByRole('button', { name: 'Kelwick' }).count()).toBe(1)
    await page.getByLabel('Find a site by name').fill('')

    // A click on the map opens the form with that spot's coordinates filled in.
    const canvas = page.getByTestId('site-map').locator('canvas')
    const box = (await canvas.boundingBox())!
    await canvas.click({ position: { x: box.width * 0.45, y: box.height * 0.55 } })
    await page.waitForURL('**/sites/new?**')
    await mapReady()
    const latitude = Number(await page.getByLabel(/^Latitude/).inputValue())
    const longitude = Number(await page.getByLabel(/^Longitude/).inputValue())
    expect(latitude).toBeGreaterThan(46.5)
    expect(latitude).toBeLessThan(49.5)
    expect(longitude).toBeGreaterThan(-36.5)
    expect(longitude).toBeLessThan(-31.5)

    await page.getByLabel('Site name').fill('Test Harbour')
    await page.getByLabel('Reference epoch (year)').fill('2020')
    await page.getByLabel('Datum name').fill(REFERENCE)
    await page.getByLabel(/^Rate/).fill('-3')
    await expect
      .poll(() => page.getByTestId('land-hint').textContent())
      .toMatch(/^Sinking 3\.0 mm\/yr adds about 0\.2\d m to the local rise between 20\d\d and 2100\.$/)
    await page.getByLabel(/^Uncertainty/).fill('0.8')
    await page.getByLabel('Source of the estimate').selectOption('gps')
    await page.getByLabel(/^Epoch/).fill('2020')
    await page.getByLabel(/^Reference \(station/).fill('GNSS station TEST (illustrative)')
    await page.getByLabel('Threshold', { exact: true }).fill('Harbour wall crest')
    await page.getByLabel('Height (m)').fill('0.5')
    await noAxeFaults('site form')
    await snap('form')
    await page.getByTestId('save-site').click()
    await page.waitForURL(url => /^\/sites\/[0-9a-f-]{36}$/.test(url.pathname))
    expect(await page.getByTestId('site-details').textContent()).toContain('-3.0 mm/yr (sinking) ± 0.8 mm/yr')

    // A small run keeps the test quick; the page follows it until the charts appear.
    await page.getByLabel('Scenario').selectOption('SSP2-4.5')
    await page.getByLabel('Samples (N)').fill('20000')
    await page.getByLabel('Seed').fill('7')
    await page.getByTestId('run-outlook-submit').click()
    await page.waitForURL('**/outlooks/**')
    await page.getByTestId('headline-sentence').first().waitFor({ timeout: 45_000 })

    const english = await sentences()
    expect(english).toHaveLength(2)
    expect(english[0]).toMatch(
      new RegExp(
        `^There is a (\\d+|less than 1|more than 99)\u00A0% chance \\((?:[a-z ;±.0-9\u00A0%]+|extrapolated: the releases do not describe this tail)\\) that the mean sea level here will be more than 0\\.50 m above ${REFERENCE.replace(/[()]/g, '\\$&')} by 2050\\.$`,
      ),
    )
    expect(english[1]).toMatch(/more than 0\.50 m above .* by 2100\.$/)
    for (const chart of ['exceedance-chart', 'fan-chart', 'timeline-chart', 'variance-chart']) {
      expect(
        await page.getByTestId(chart).getByTestId('chart-table').last().locator('tbody tr').count(),
        chart,
      ).toBeGreaterThan(3)
    }
    await page.getByTestId('exceedance-chart').locator('svg').first().waitFor()
    expect(suite.cspViolations, 'content security policy violations on the outlook page').toEqual([])
    const triggers = page.getByTestId('timeline-chart').getByTestId('chart-table').first()
    expect(await triggers.locator('tbody th').allTextContents()).toEqual(['Harbour wall crest (0.50 m)'])
    expect(await page.getByTestId('fan-chart').locator('svg').count()).toBeGreaterThan(0)
    expect(await page.getByTestId('outlook-inputs').textContent()).toMatch(/Input hash[0-9a-f]{64}/)
    expect(await page.getByTestId('outlook-notes').textContent()).toContain(
      'No correlation set is published for SSP2-4.5; the components were sampled as independent.',
    )
    expect(await page.getByTestId('cautions').textContent()).toContain('projections, not predictions')
    await noAxeFaults('outlook page')
    await snap('outlook')

    await page.getByText('feet', { exact: true }).click()
    await expect.poll(async () => (await sentences())[0]).toContain('more than 1.6 ft above')

    await page.getByTestId('language-switcher').selectOption('es')
    await expect
      .poll(async () => (await sentences())[0])
      .toMatch(
        /^Hay una probabilidad (del|de menos del|de más del) .* de que el nivel medio del mar aquí esté más de 1,6 ft por encima de .* en 2050\.$/,
      )
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('Perspectiva para Test Harbour')
    // The notes on how it was put together are stored as facts and worded in the reader's language.
    expect(await page.getByTestId('outlook-notes').textContent()).toContain(
      'No hay ningún conjunto de correlaciones publicado para SSP2-4.5; los componentes se muestrearon como independientes.',
    )
    await noAxeFaults('outlook page in Spanish')
    await snap('outlook-es-ft')

    // The chart axes write numbers as the sentences beside them do: with a decimal comma in Spanish.
    await page.getByText('metros', { exact: true }).click()
    const axisLabels = () => page.getByTestId('fan-chart').locator('svg text').allTextContents()
    await expect.poll(async () => (await axisLabels()).some(label => /^\d+,\d+$/.test(label))).toBe(true)
    expect((await axisLabels()).filter(label => /^\d+\.\d+$/.test(label))).toEqual([])
    await screenshot(page, 'sites-outlook-es-axes')

    // Back to English and metres, so the account is left as the demo has it.
    await Promise.all([
      page.waitForResponse(response => response.url().endsWith('/api/me') && response.request().method() === 'PATCH'),
      page.getByTestId('language-switcher').selectOption('en'),
    ])
    await page.getByText('metres', { exact: true }).click()
  })
})

describe('who may see and change a site', () => {
  it('a reader sees the sites and a site read-only', async () => {
    await signIn(page, READER.email, READER.password)
    await nav().getByRole('link', { name: 'Sites' }).click()
    await page.waitForURL('**/sites')
    await mapReady()
    expect(await page.getByTestId('add-site').count()).toBe(0)
    await page.getByTestId('site-table').getByRole('link', { name: 'Kelwick' }).click()
    await page.waitForURL(url => /^\/sites\/[0-9a-f-]{36}$/.test(url.pathname))
    await page.getByTestId('read-only-note').waitFor()
    expect(await page.getByTestId('edit-site').count()).toBe(0)
    expect(await page.getByTestId('run-outlook').count()).toBe(0)
    await noAxeFaults('site page, reader')

    const response = await open(page, '/sites/new')
    expect(response?.status()).toBe(403)
  })

  it('the port\'s planner cannot open the council\'s site', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const councilSites = await (await page.request.get('/api/sites')).json() as { id: string, name: string }[]
    const kelwick = councilSites.find(site => site.name === 'Kelwick')!

    page = await suite.freshContext()
    await signIn(page, PORT_PLANNER.email, PORT_PLANNER.password)
    const response = await open(page, `/sites/${kelwick.id}`)
    expect(response?.status()).toBe(404)
    expect(await page.getByRole('heading', { level: 1 }).textContent()).toBe('404')
    expect(await page.textContent('main')).not.toContain('Kelwick')
  })
})
