import { beforeEach, describe, expect, it } from 'vitest'
import { PLANNER } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

// Signposts on Kelwick's pathways page: the trade-off chart, its table, and the chosen signal said in
// a sentence that follows the reader's choice.
const suite = useBrowserSuite('signposts')
let page: Page
beforeEach(() => ({ page } = suite))

const plain = (text: string | null) => (text ?? '').replace(/[\s\u00A0\u202F]+/g, ' ').trim()

describe('signposts', () => {
  it('shows the trade-off of a gauge-rate signal, axe-clean, and words the chosen signal', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const sites = await (await page.request.get('/api/sites')).json() as { id: string, name: string }[]
    const kelwick = sites.find(site => site.name === 'Kelwick')!.id
    const started = await page.request.post(`/api/sites/${kelwick}/outlooks`, {
      data: { scenario: 'SSP2-4.5', samples: 20_000, seed: 2 },
    })
    expect(started.ok(), await started.text()).toBe(true)
    const { id } = await started.json() as { id: string }
    await expect.poll(async () => (await (await page.request.get(`/api/outlooks/${id}/status`)).json()).state,
      { timeout: 60_000 }).toBe('done')

    await open(page, `/sites/${kelwick}/pathways`)
    const sentence = page.getByTestId('signposts-sentence')
    await sentence.waitFor()
    const first = plain(await sentence.textContent())
    const share = '(?:less than |more than )?[\\d.]+ %'
    expect(first).toMatch(new RegExp(
      `^A signal of [\\d.]+ mm/yr by 2030 would have fired too late to decide on Raise the quay wall by 0\\.4 m in ${share} `
      + `of the outlook's futures, not fired at all in ${share} that needed it, and fired needlessly in ${share}\\.$`,
    ))
    // Nearly every future of this demo passes the quay wall by 2150, so no signal can fire needlessly:
    // the page says so and the chart shows lateness by threshold instead of a needless axis stuck at 0.
    const [pathway] = (await (await page.request.get(`/api/sites/${kelwick}/pathways`)).json()).pathways
    const query = new URLSearchParams({ pathway: pathway.id, measure: pathway.measureIds[0], scenario: 'SSP2-4.5' })
    const needless = await (await page.request.get(`/api/sites/${kelwick}/signposts?${query}`)).json() as {
      curves: { points: { needless: number }[] }[]
    }
    const lateOnly = needless.curves.every(c => c.points.every(p => p.needless < 0.01))
    expect(await page.getByTestId('signposts-late-only').isVisible()).toBe(lateOnly)
    expect(plain(await page.getByTestId('signposts-method').textContent()))
      .toMatch(/year-to-year noise of the site's gauge record as fitted/)
    // Another threshold, another sentence; the table lists every threshold of the signal year.
    const options = page.getByTestId('signposts-threshold').locator('option')
    await page.getByTestId('signposts-threshold').selectOption({ index: (await options.count()) - 1 })
    expect(plain(await sentence.textContent())).not.toBe(first)
    await page.getByTestId('signposts-chart').getByText('Show the numbers as a table').click()
    expect(await page.getByTestId('signposts-chart').locator('tbody tr').count()).toBe(await options.count())
    await page.getByTestId('signposts-chart').locator('svg').first().waitFor()
    expect(await seriousAxeViolations(page), 'signposts').toEqual([])
    await page.getByTestId('signposts').scrollIntoViewIfNeeded()
    await screenshot(page, 'signposts-1366')
  })
})
