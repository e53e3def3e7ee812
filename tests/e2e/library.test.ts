import { beforeEach, describe, expect, it } from 'vitest'
import { ANALYST, demoUser } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

const REVIEWER = demoUser('reviewer@saltglass.example')

const suite = useBrowserSuite('library')
let page: Page
beforeEach(() => ({ page } = suite))

// Invented numbers for a glacier series, in metres: a quantile table as an analyst would export it.
const QUANTILE_CSV = [
  'level,2050,2100',
  '0.05,0.031,0.062',
  '0.17,0.04,0.081',
  '0.5,0.052,0.108',
  '0.83,0.064,0.137',
  '0.95,0.074,0.158',
].join('\n')
const TITLE = 'Glacier melt, browser test (illustrative)'

async function startSession(email: string, password: string) {
  page = await suite.freshContext()
  await signIn(page, email, password)
}

const nav = () => page.getByTestId('main-nav')
// Steps worth looking at by eye, kept only when every screenshot is asked for.
const snap = (name: string) =>
  process.env.BRINKWATER_SCREENSHOTS === 'all' ? screenshot(page, `library-step-${name}`) : undefined
const noAxeFaults = async (where: string) => expect(await seriousAxeViolations(page), where).toEqual([])

describe('publishing a release through the library', () => {
  it('an analyst uploads a quantile CSV, previews and submits; another analyst approves; everyone then sees it published', async () => {
    await signIn(page, ANALYST.email, ANALYST.password)
    await nav().getByRole('link', { name: 'Library' }).click()
    await page.waitForURL('**/library')
    await noAxeFaults('library, signed in')

    await page.getByTestId('new-release').click()
    await page.waitForURL('**/library/new')
    const editor = page.getByTestId('release-editor')
    await editor.getByLabel('Component').selectOption('glaciers')
    await editor.getByLabel('Scenario', { exact: true }).fill('SSP2-4.5')
    await editor.getByLabel('Title').fill(TITLE)
    await editor.getByTestId('form-quantiles').check()
    await editor
      .getByLabel('Upload a quantile table (CSV)')
      .setInputFiles({ name: 'glaciers-ssp245.csv', mimeType: 'text/csv', buffer: Buffer.from(QUANTILE_CSV) })
    await expect
      .poll(() => editor.getByTestId('csv-loaded').textContent())
      .toMatch(/glaciers-ssp245\.csv \(5 data rows\)/)

    // The preview is the engine's answer for the uploaded table: a chart and no problems listed.
    const preview = page.getByTestId('release-preview')
    await preview.locator('svg').first().waitFor()
    await expect.poll(() => preview.getByTestId('preview-problems').count()).toBe(0)
    await preview.getByText('Show the numbers as a table').click()
    await expect.poll(() => preview.locator('tbody tr').last().textContent()).toMatch(/2100\s*0\.11 m/)

    await editor
      .getByLabel('Method')
      .fill('Invented for the browser test: a quantile table shaped like a glacier model ensemble.')
    await editor.getByLabel('Citation').fill('Browser test (illustrative), 2026.')
    await editor.getByLabel('Licence').fill('CC BY 4.0')
    await noAxeFaults('editor with a preview')
    await snap('editor-preview')
    await editor.getByTestId('save-draft').click()
    await page.waitForURL(/\/library\/releases\/[0-9a-f-]+\?saved=1$/)
    const releasePath = new URL(page.url()).pathname
    await expect.poll(() => page.getByTestId('state-badge').first().textContent()).toBe('Draft')

    await page.getByRole('button', { name: 'Submit for review' }).click()
    await expect.poll(() => page.getByTestId('release-notice').textContent()).toMatch(/Submitted/)
    await expect.poll(() => page.getByTestId('state-badge').first().textContent()).toBe('In review')
    // The author never approves their own release: the button is not offered.
    expect(await page.getByRole('button', { name: 'Approve and publish' }).count()).toBe(0)
    await noAxeFaults('release in review')
    await snap('author-in-review')

    await startSession(REVIEWER.email, REVIEWER.password)
    await open(page, '/library')
    const queue = page.getByTestId('review-queue')
    await snap('reviewer-queue')
    await queue.getByRole('link', { name: TITLE }).click()
    await page.waitForURL(`**${releasePath}`)
    await noAxeFaults('release, as reviewer')
    // Publishing computes sites again and mails their watchers, so it is confirmed knowing how many.
    await page.getByRole('button', { name: 'Approve and publish' }).click()
    await expect
      .poll(() => page.getByTestId('approve-reach').textContent())
      .toMatch(/^\s*Approving publishes it at once(; no site| and the outlooks of (one site|\d+ sites))/)
    await noAxeFaults('approval confirmation')
    await snap('approve-confirm')
    await page.getByRole('button', { name: 'Publish now' }).click()
    await expect.poll(() => page.getByTestId('state-badge').first().textContent()).toBe('Published')
    await open(page, '/library')
    await expect.poll(() => page.getByTestId('review-queue-empty').count()).toBe(1)

    // Signed out, the published release is in the public library with its numbers.
    page = await suite.freshContext()
    await open(page, '/library?component=glaciers&scenario=SSP2-4.5')
    const row = page.getByRole('row').filter({ hasText: TITLE })
    expect(await row.getByTestId('state-badge').textContent()).toBe('Published')
    expect(await row.textContent()).toMatch(/0\.11 m/)
    expect(await page.getByTestId('sign-in-link').isVisible()).toBe(true)
    await noAxeFaults('library, signed out')
    await row.getByRole('link', { name: TITLE, exact: true }).click()
    await page.waitForURL(`**${releasePath}`)
    expect(await page.getByTestId('review-actions').count()).toBe(0)
    await page.getByTestId('bands-chart').locator('svg').first().waitFor()
    await noAxeFaults('release, signed out')
  })

  it('names the problem in a typed quantile table and saves nothing', async () => {
    await signIn(page, ANALYST.email, ANALYST.password)
    await open(page, '/library/new')
    const editor = page.getByTestId('release-editor')
    const grid = editor.getByTestId('quantile-grid')
    await expect.poll(() => page.getByTestId('preview-waiting').count()).toBe(1)
    // 2050 falls from the 17th to the 50th percentile: quantiles must not decrease.
    const columns = { 2050: ['0.05', '0.06', '0.04', '0.08', '0.09'], 2100: ['0.1', '0.12', '0.15', '0.18', '0.2'] }
    for (const [year, values] of Object.entries(columns)) {
      for (const [k, level] of ['0.05', '0.17', '0.5', '0.83', '0.95'].entries())
        await grid.getByLabel(`Value at level ${level}, ${year}`).fill(values[k]!)
    }
    // The engine's own check keeps its words, under the column's name rather than its code.
    await expect
      .poll(() => page.getByTestId('preview-problems').textContent())
      .toMatch(/Values for 2050: Must be non-decreasing across levels/)
    await editor.getByTestId('save-draft').click()
    await expect.poll(() => editor.getByTestId('editor-error').textContent()).toMatch(/Nothing was saved/)
    expect(new URL(page.url()).pathname).toBe('/library/new')
    // Each refused field says so beside it, by its label, and the alert counts them.
    const method = page.locator('#prov-method-msg')
    await expect.poll(() => method.textContent()).toBe('Method: Fill this in.')
    expect(await editor.getByTestId('editor-error').textContent()).toMatch(/6 fields need a change/)
    // Mending a field clears its message at once, before saving again.
    await editor.getByLabel('Method').fill('Typed for the browser test.')
    await expect.poll(() => method.textContent()).toBe('')
    expect(await editor.getByTestId('editor-error').textContent()).toMatch(/5 fields need a change/)
    await grid.getByLabel('Value at level 0.5, 2050').fill('0.07')
    await expect.poll(() => page.getByTestId('preview-problems').count()).toBe(0)
  })
})

describe('the library for visitors', () => {
  it('shows superseded history and what changed, and reads in Spanish', async () => {
    await open(page, '/library?component=greenland&scenario=SSP2-4.5')
    await page.getByRole('link', { name: /Version history/ }).first().click()
    await page.waitForURL('**/library/series/**')
    expect(await page.getByTestId('versions-table').textContent()).toMatch(/Superseded/)
    expect(await page.getByTestId('series-change').first().textContent()).toMatch(/From version 1 to version 2/)
    await noAxeFaults('series history')
    await snap('series-history')

    await open(page, '/library')
    await page.getByTestId('language-switcher').selectOption('es')
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Biblioteca')
    expect(await page.getByTestId('releases-table').textContent()).toMatch(/Publicada/)
    expect(await nav().getByRole('link').allTextContents()).toEqual(['Biblioteca'])
    await noAxeFaults('library in Spanish')
  })
})
