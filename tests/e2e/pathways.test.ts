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

/** A loaded machine may take seconds to refresh the page after a change. */
const SLOW = { timeout: 15_000 }
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

  it('changes and deletes measures and pathways, refusing what a pathway or record rests on', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const sites = await (await page.request.get('/api/sites')).json() as { id: string, name: string }[]
    const kelwick = sites.find(site => site.name === 'Kelwick')!.id
    for (const name of ['Floodable park', 'Set-back line']) {
      const made = await page.request.post(`/api/sites/${kelwick}/measures`, {
        data: { name, height: 0.9, kind: 'mean-sea-level', leadTimeYears: 6 },
      })
      expect(made.ok(), await made.text()).toBe(true)
    }
    await open(page, `/sites/${kelwick}/pathways`)
    const table = page.getByTestId('measures-table')
    const row = (name: string) => table.locator('tbody tr').filter({ hasText: name })

    // Change: the form takes the measure's values and its heading the focus.
    await row('Floodable park').getByRole('button', { name: 'Change “Floodable park”' }).click()
    const form = page.getByTestId('measure-form')
    await expect.poll(() => page.evaluate(() => document.activeElement?.id), SLOW).toBe('measure-form-title')
    expect(await form.getByLabel('Name').inputValue()).toBe('Floodable park')
    await form.getByLabel('Lead time (years)').fill('9')
    await form.getByRole('button', { name: 'Save the measure' }).click()
    await expect.poll(async () => plain(await row('Floodable park').textContent() ?? ''), SLOW).toContain('9 years')

    // Delete asks first; a measure a pathway lists is refused with the pathway's name.
    const made = await page.request.post(`/api/sites/${kelwick}/pathways`, {
      data: { name: 'Soft defences', measureIds: await measureIds(page, kelwick, ['Floodable park', 'Set-back line']) },
    })
    expect(made.ok(), await made.text()).toBe(true)
    await open(page, `/sites/${kelwick}/pathways`)
    await row('Set-back line').getByRole('button', { name: 'Delete “Set-back line”' }).click()
    const confirm = row('Set-back line').getByTestId('item-delete-confirm')
    expect(plain(await confirm.textContent() ?? '')).toMatch(/Delete “Set-back line”\? This cannot be undone\./)
    expect(await seriousAxeViolations(page), 'pathways page, confirming a deletion').toEqual([])
    await confirm.getByTestId('item-delete-yes').click()
    expect(plain(await row('Set-back line').getByTestId('item-error').textContent() ?? '')).toBe(
      '"Set-back line" is step 2 of the pathway "Soft defences"; remove it from that pathway (or delete the pathway) first.',
    )

    // The pathway goes; then the measure can.
    const card = page.getByTestId('pathway').filter({ hasText: 'Soft defences' })
    await card.getByRole('button', { name: 'Delete the pathway “Soft defences”' }).click()
    await card.getByTestId('item-delete-yes').click()
    await expect.poll(() => page.getByTestId('pathway').filter({ hasText: 'Soft defences' }).count(), SLOW).toBe(0)
    await row('Set-back line').getByRole('button', { name: 'Delete “Set-back line”' }).click()
    await row('Set-back line').getByTestId('item-delete-yes').click()
    await expect.poll(() => row('Set-back line').count(), SLOW).toBe(0)
    await screenshot(page, 'pathways-after-edits')
    expect(await seriousAxeViolations(page), 'pathways page after edits').toEqual([])
  })
})

async function measureIds(on: Page, siteId: string, names: string[]) {
  const view = await (await on.request.get(`/api/sites/${siteId}/pathways`)).json() as {
    measures: Array<{ id: string, name: string }>
  }
  return names.map(name => view.measures.find(m => m.name === name)!.id)
}
