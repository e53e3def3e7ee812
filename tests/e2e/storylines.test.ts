import { beforeEach, describe, expect, it } from 'vitest'
import { ANALYST, demoUser } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

// A high-end storyline goes through the library like any science: an analyst drafts it in the form
// (issues beside their fields), submits it, a second analyst approves it, and the public library lists it.

const suite = useBrowserSuite('storylines')
const REVIEWER = demoUser('reviewer@saltglass.example')
let page: Page
beforeEach(() => ({ page } = suite))

describe('high-end storylines in the library', () => {
  it('are drafted in a form, reviewed by a second analyst and listed once published', async () => {
    await signIn(page, ANALYST.email, ANALYST.password)
    await open(page, '/library/storylines/new')
    await page.fill('#story-scenario', 'SSP5-8.5')
    await page.fill('#story-name', 'Browser-test early collapse')
    await page.fill('#story-description', 'Part of an ice sheet is lost early (test case).')
    await page.fill('#story-anchors', '2050 2100')
    // One value for two anchor years: the issue sits beside that component's field, in words.
    await page.fill('#story-values-antarctica', '0,2')
    await page.getByRole('button', { name: 'Save draft' }).click()
    await expect
      .poll(() => page.locator('#story-values-antarctica-msg').textContent())
      .toBe('Antarctic ice sheet: Give one value per anchor year (2).')
    await page.fill('#story-values-antarctica', '0,2 1,1')
    await expect.poll(() => page.locator('#story-values-antarctica-msg').textContent()).toBe('')
    await page.fill('#prov-method', 'Expert judgement of an early loss (test).')
    await page.fill('#prov-citation', 'Browser test (2026).')
    await page.fill('#prov-licence', 'CC BY 4.0')
    expect(await seriousAxeViolations(page)).toEqual([])
    await screenshot(page, 'storylines-form')
    await page.getByRole('button', { name: 'Save draft' }).click()
    await page.waitForURL(url => /\/library\/storylines\/[0-9a-f-]{36}$/.test(url.pathname))
    const storylinePath = new URL(page.url()).pathname
    // Values are shown as entered, in the reader's units, with the decimal comma read as a point.
    expect(await page.getByTestId('storyline-table').textContent()).toMatch(/Antarctic ice sheet\s*0\.20 m\s*1\.10 m/)
    await page.getByTestId('review-submit').click()
    await expect.poll(() => page.getByTestId('state-badge').first().textContent()).toBe('In review')

    page = await suite.freshContext()
    await signIn(page, REVIEWER.email, REVIEWER.password)
    await open(page, storylinePath)
    await page.getByRole('button', { name: 'Approve and publish' }).click()
    await page.getByRole('button', { name: 'Publish now' }).click()
    await expect.poll(() => page.getByTestId('state-badge').first().textContent()).toBe('Published')

    page = await suite.freshContext()
    await open(page, '/library')
    const listed = page.getByTestId('storylines')
    expect(await listed.textContent()).toContain('Browser-test early collapse')
    expect(await seriousAxeViolations(page)).toEqual([])
  })
})
