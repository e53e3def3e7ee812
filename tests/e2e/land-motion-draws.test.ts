import { beforeEach, describe, expect, it } from 'vitest'
import { PLANNER } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

const suite = useBrowserSuite('land-motion-draws')
let page: Page
beforeEach(() => ({ page } = suite))

/** 120 draws of −3 ± 1 mm/yr, evenly spaced. */
const DRAWS = `draw,rate_mm_per_year\n${Array.from({ length: 120 }, (_, i) => `${i + 1},${(-4 + (2 * i) / 119).toFixed(3)}`).join('\n')}\n`

describe('land-motion draws on the site page', () => {
  it('a planner uploads draws, is told what to fix first, and reads their summary', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const sites = await (await page.request.get('/api/sites')).json() as { id: string, name: string }[]
    await open(page, `/sites/${sites.find(site => site.name === 'Kelwick')!.id}`)
    const section = page.getByTestId('land-draws')
    await section.getByTestId('land-draws-none').waitFor()

    await section.getByLabel('Or paste the CSV').fill(DRAWS.replace('\n7,', '\n6,'))
    await section.getByRole('button', { name: 'Upload draws' }).click()
    await expect.poll(() => section.locator('#land-draws-msg').textContent())
      .toContain('CSV file, row 8, column draw: Draw 6 is also on row 7; give one rate per draw.')

    await section.getByLabel('Or paste the CSV').fill(DRAWS)
    await section.getByLabel('Source of the estimate').selectOption('insar')
    await section.getByRole('button', { name: 'Upload draws' }).click()
    await section.getByTestId('land-draws-stored').waitFor()
    expect(await section.getByTestId('land-draws-summary').textContent()).toContain(
      'Version 1: 120 draws, median -3.00 mm/yr',
    )
    // The site's own card says its stated rate is no longer what outlooks sample.
    const used = page.getByTestId('site-land-motion-draws-used')
    await used.waitFor()
    expect(await used.textContent()).toContain('Outlooks use the land-motion draws below (version 1) in place of this rate.')
    expect(await section.getByTestId('land-draws-stored').textContent()).toContain('the next outlook uses it')
    expect(await seriousAxeViolations(page)).toEqual([])
    await section.scrollIntoViewIfNeeded()
    await screenshot(page, 'land-motion-draws-stored')
  })
})
