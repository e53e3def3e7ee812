import { beforeEach, describe, expect, it } from 'vitest'
import { ANALYST, PLANNER } from '../support/demo-users'
import { open, signIn, withholdIdleCallbacks, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

// A browser that never grants an idle period (Chromium with an animation running can be one) must
// still finish every save and run: no user action may wait for an idle callback. Each step presses a
// form's button and waits for the page the action leads to, with its working label gone.
const suite = useBrowserSuite('busy-browser')
let page: Page
beforeEach(async () => {
  ;({ page } = suite)
  await withholdIdleCallbacks(suite.context)
})

const UUID = '[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}'
const CSV = [
  'level,2050,2100',
  '0.05,0.031,0.062',
  '0.17,0.04,0.081',
  '0.5,0.052,0.108',
  '0.83,0.064,0.137',
  '0.95,0.074,0.158',
].join('\n')

describe('in a browser that never goes idle', () => {
  it('idle callbacks really are withheld on the test page', async () => {
    await open(page, '/')
    const fired = await page.evaluate(() => new Promise<boolean>((resolve) => {
      window.requestIdleCallback(() => resolve(true))
      requestAnimationFrame(() => requestAnimationFrame(() => setTimeout(() => resolve(false), 200)))
    }))
    expect(fired).toBe(false)
  })

  it('a planner saves a site, runs an outlook, saves and edits a briefing draft, and every page moves on', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    await open(page, '/sites/new?latitude=48.1&longitude=-33.9')
    await page.getByLabel('Site name').fill('Busy Quay (illustrative)')
    await page.getByLabel('Reference epoch (year)').fill('2020')
    await page.getByLabel('Datum name').fill('mean sea level 2020 (illustrative)')
    await page.getByLabel(/^Rate/).fill('-1')
    await page.getByLabel(/^Uncertainty/).fill('0.5')
    await page.getByLabel(/^Epoch/).fill('2020')
    await page.getByLabel('Threshold', { exact: true }).fill('Quay edge')
    await page.getByLabel('Height (m)').fill('0.4')
    await page.getByTestId('save-site').click()
    await page.waitForURL(url => new RegExp(`^/sites/${UUID}$`).test(url.pathname))
    await expect.poll(() => page.getByTestId('site-details').textContent()).toContain('-1.0 mm/yr')

    await page.getByLabel('Scenario').selectOption('SSP2-4.5')
    await page.getByLabel('Samples (N)').fill('5000')
    await page.getByTestId('run-outlook-submit').click()
    await page.waitForURL(url => new RegExp(`^/sites/${UUID}/outlooks/${UUID}$`).test(url.pathname))
    await page.getByTestId('headline-sentence').first().waitFor({ timeout: 45_000 })
    const outlookId = new URL(page.url()).pathname.split('/').pop()

    await open(page, `/briefings/new?outlookId=${outlookId}`)
    const form = page.getByTestId('briefing-form')
    await form.getByLabel('Title', { exact: true }).fill('Busy Quay: first draft')
    await form.getByTestId('form-submit').click()
    await page.waitForURL(url => new RegExp(`^/briefings/${UUID}$`).test(url.pathname))
    const briefingPath = new URL(page.url()).pathname
    await expect.poll(() => page.getByTestId('draft-banner').count()).toBe(1)

    await open(page, `${briefingPath}/edit`)
    await page.getByTestId('briefing-form').getByLabel('Title', { exact: true }).fill('Busy Quay: second draft')
    await page.getByTestId('briefing-form').getByTestId('form-submit').click()
    await page.waitForURL(url => url.pathname === briefingPath)
    // The page shows the saved title, not what it had cached before the edit.
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toMatch(/second draft/)
  })

  it('an analyst saves a release draft and submits it for review, and the page follows each step', async () => {
    await signIn(page, ANALYST.email, ANALYST.password)
    await open(page, '/library/new')
    const editor = page.getByTestId('release-editor')
    await editor.getByLabel('Component').selectOption('glaciers')
    await editor.getByLabel('Scenario', { exact: true }).fill('SSP1-2.6')
    await editor.getByLabel('Title').fill('Glaciers, busy browser (illustrative)')
    await editor.getByTestId('form-quantiles').check()
    await editor
      .getByLabel('Upload a quantile table (CSV)')
      .setInputFiles({ name: 'glaciers.csv', mimeType: 'text/csv', buffer: Buffer.from(CSV) })
    // The preview chart is drawing (and animating) while the draft is saved.
    await page.getByTestId('release-preview').locator('svg').first().waitFor()
    await editor.getByLabel('Method').fill('Invented for the browser test.')
    await editor.getByLabel('Citation').fill('Browser test (illustrative), 2026.')
    await editor.getByLabel('Licence').fill('CC BY 4.0')
    await editor.getByTestId('save-draft').click()
    await page.waitForURL(new RegExp(`/library/releases/${UUID}\\?saved=1$`))
    await expect.poll(() => page.getByTestId('state-badge').first().textContent()).toBe('Draft')

    await page.getByRole('button', { name: 'Submit for review' }).click()
    await expect.poll(() => page.getByTestId('state-badge').first().textContent()).toBe('In review')
  })
})
