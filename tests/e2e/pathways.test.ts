import { execFileSync } from 'node:child_process'
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { beforeEach, describe, expect, it } from 'vitest'
import { PLANNER } from '../support/demo-users'
import { SCREENSHOT_DIR, open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

// Kelwick's illustrative pathway on the page (chart, table, the spread across scenarios, a decision
// recorded through the form) and in the PDF, whose chart is drawn on the server.
const suite = useBrowserSuite('pathways')
let page: Page
beforeEach(() => ({ page } = suite))

const plain = (text: string) => text.replace(/[\s\u00A0\u202F]+/g, ' ').trim()

describe('adaptation pathways', () => {
  it('shows the chart with its data table, axe-clean, records a decision, and renders the PDF', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const sites = await (await page.request.get('/api/sites')).json() as { id: string, name: string }[]
    const kelwick = sites.find(site => site.name === 'Kelwick')!.id
    for (const scenario of ['SSP2-4.5', 'SSP5-8.5']) {
      const started = await page.request.post(`/api/sites/${kelwick}/outlooks`, {
        data: { scenario, samples: 20_000, seed: 2 },
      })
      expect(started.ok(), await started.text()).toBe(true)
    }

    await open(page, `/sites/${kelwick}`)
    await page.getByTestId('site-pathways').click()
    await page.waitForURL(`**/sites/${kelwick}/pathways`)
    await page.getByTestId('pathway').first().waitFor()
    // Tipping years computed after the outlooks finished appear on the page without a reload.
    await page.getByTestId('pathways-computing').waitFor({ state: 'detached', timeout: 60_000 })
    expect(await page.getByTestId('pathway-illustrative').textContent()).toMatch(/Illustrative/)
    // The main message: between which years, across scenarios, the raise must be decided.
    const spread = plain(await page.getByTestId('pathway-spread').first().textContent() ?? '')
    expect(spread).toMatch(
      /Decide on Raise the quay wall by 0\.4 m (between \d{4} \(SSP\d-\d\.\d\) and \d{4} \(SSP\d-\d\.\d\)|by \d{4})/,
    )
    // The table beside the chart holds a row per step and scenario.
    const rows = page.getByTestId('pathway-table').first().locator('tbody tr')
    expect(await rows.count()).toBe(3 * 2)
    expect(await page.getByTestId('pathway-chart').first().locator('svg rect').count()).toBeGreaterThan(3)
    // Focusing a lane reads it out.
    await page.getByTestId('pathway-chart').first().locator('g[tabindex="0"]').first().focus()
    expect(await page.getByTestId('pathway-chart-reading').first().textContent()).toMatch(
      /Today's quay wall under SSP\d-\d\.\d: serves from/,
    )
    expect(await seriousAxeViolations(page), 'pathways page').toEqual([])
    await page.setViewportSize({ width: 1366, height: 900 })
    await screenshot(page, 'pathways-1366')
    await page.setViewportSize({ width: 390, height: 844 })
    await screenshot(page, 'pathways-390')
    expect(await seriousAxeViolations(page), 'pathways page, narrow').toEqual([])
    await page.setViewportSize({ width: 1366, height: 900 })

    // A decision through the form, listed with what it rests on.
    const form = page.getByTestId('record-form')
    await form.getByLabel('Measure decided on').selectOption({ label: 'Raise the quay wall by 0.4 m' })
    await form.getByLabel('Rationale').fill('Council resolution 7/2026 (illustrative).')
    await form.getByTestId('record-submit').click()
    const record = page.getByTestId('decision-record').first()
    await record.waitFor()
    expect(plain((await record.textContent()) ?? '')).toMatch(
      /Raise the quay wall by 0\.4 m: SSP\d-\d\.\d, tolerance 10 %.*Council resolution 7\/2026/,
    )

    const pdf = await page.request.get(`/api/sites/${kelwick}/pathways.pdf?language=en`)
    expect(pdf.ok()).toBe(true)
    mkdirSync(SCREENSHOT_DIR, { recursive: true })
    const file = resolve(SCREENSHOT_DIR, 'pathways.pdf')
    writeFileSync(file, await pdf.body())
    const text = plain(execFileSync('pdftotext', ['-enc', 'UTF-8', file, '-'], { encoding: 'utf8' }))
    expect(text).toMatch(/Adaptation pathways: Kelwick/)
    expect(text).toMatch(/Illustrative: invented demonstration content/)
    expect(text).toMatch(/Decision year already past|Decision year/)
    // The rationale wraps inside its table cell.
    expect(text).toMatch(/Council resolution/)
    expect(text).toMatch(/projections, not predictions/)
    execFileSync('pdftoppm', ['-png', '-r', '60', file, resolve(SCREENSHOT_DIR, 'pathways-pdf')])
  })
})
