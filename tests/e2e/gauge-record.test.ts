import { beforeEach, describe, expect, it } from 'vitest'
import { PLANNER } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

// A planner's tide-gauge record in the browser: Kelwick's invented annual record (1979–2025, a gap in
// 1996–1997) on the site page with its fit and tracking, an outlook updated by the record's values
// since the 2020 epoch beside the unweighted numbers, the briefing section saying method and limits,
// and an upload refused by row then stored.
const suite = useBrowserSuite('gauge-record')
let page: Page
beforeEach(() => ({ page } = suite))

const plain = (text: string | null) => (text ?? '').replace(/[\s\u00A0\u202F]+/g, ' ').trim()

async function kelwickOutlook() {
  const sites = await (await page.request.get('/api/sites')).json() as { id: string, name: string }[]
  const site = sites.find(s => s.name === 'Kelwick')!.id
  const started = await page.request.post(`/api/sites/${site}/outlooks`, {
    data: { scenario: 'SSP2-4.5', samples: 20_000, seed: 3 },
  })
  expect(started.ok(), await started.text()).toBe(true)
  const { id } = await started.json() as { id: string }
  await expect.poll(async () => (await (await page.request.get(`/api/outlooks/${id}/status`)).json()).state,
    { timeout: 60_000 }).toBe('done')
  return { site, outlook: id }
}

describe('a site\'s tide-gauge record', () => {
  it('shows the record, its fit and tracking, and the outlook and briefing updated by it', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const { site, outlook } = await kelwickOutlook()

    await open(page, `/sites/${site}`)
    const record = page.getByTestId('gauge-record')
    await record.waitFor()
    expect(plain(await page.getByTestId('gauge-summary').textContent())).toMatch(/1979.*2025.*1996.*1997/)
    expect(plain(await page.getByTestId('gauge-fit').textContent())).toMatch(/[\d.]+ ± [\d.]+ mm\/yr.*[\d.]+ ± [\d.]+ mm\/yr²/)
    // The outlook just computed is tracked: below, within or above its likely range, in words.
    const tracked = page.getByTestId('gauge-tracking').locator('li[data-status]')
    await tracked.first().waitFor()
    expect(await tracked.first().getAttribute('data-status')).toMatch(/^(below|within|above|unclear|too-soon)$/)
    expect(plain(await tracked.first().textContent())).toMatch(/SSP2-4\.5/)
    expect(await seriousAxeViolations(page), 'site page with a gauge record').toEqual([])
    await record.scrollIntoViewIfNeeded()
    await screenshot(page, 'gauge-record-site')

    await open(page, `/sites/${site}/outlooks/${outlook}`)
    const update = page.getByTestId('observation-update')
    await update.waitFor()
    expect(await page.getByTestId('observation-update-refused').count()).toBe(0)
    // Six gauge years since the 2020 epoch (2020–2025) weigh the trajectories; the effective size is said.
    expect(plain(await update.textContent())).toMatch(/6 values from 2020 to 2025.*effective sample size/)
    // Read only as far ahead as it spans: the numbers beside the outlook's are for 2030, not 2100.
    expect(plain(await page.getByTestId('observation-update-reach').textContent()))
      .toMatch(/read in full to 2025, less each year after, and not at all from 2031/)
    expect(plain(await update.locator('thead').textContent())).toContain('In 2030')
    const ranges = await page.getByTestId('observation-update-range').allTextContents()
    expect(ranges.length).toBeGreaterThan(0)
    for (const range of ranges) expect(plain(range)).toMatch(/^[\d.]+ m to [\d.]+ m$/)
    // The limit of a short record is said beside the numbers: late years rest on the unweighted range.
    expect(plain(await update.textContent())).toMatch(/later in the century|late years|unweighted range/i)
    expect(await seriousAxeViolations(page), 'outlook updated by the gauge record').toEqual([])
    await update.scrollIntoViewIfNeeded()
    await screenshot(page, 'gauge-record-outlook-update')

    const thresholds = (await (await page.request.get(`/api/sites/${site}`)).json()).thresholds as { id: string }[]
    const draft = await page.request.post('/api/briefings', {
      data: {
        outlookId: outlook, comparisonOutlookIds: [], title: 'Kelwick: what the gauge says', audience: 'Harbour board',
        localContext: '', language: 'en', units: 'm', thresholdIds: thresholds.map(t => t.id), years: [2050, 2100],
      },
    })
    expect(draft.status(), await draft.text()).toBe(201)
    const { id: briefing } = await draft.json() as { id: string }
    await open(page, `/briefings/${briefing}`)
    const section = page.getByTestId('briefing-observation-update')
    await section.waitFor()
    expect(plain(await section.textContent())).toMatch(/updated by the tide-gauge record/i)
    expect(plain(await section.textContent())).toMatch(/likely range of rise \(17–83 %\) is .* in the outlook and .* updated/)
    await section.scrollIntoViewIfNeeded()
    await screenshot(page, 'gauge-record-briefing')
  })

  it('refuses an upload by row and says what to fix, keeps the text, then stores a corrected one', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const sites = await (await page.request.get('/api/sites')).json() as { id: string, name: string }[]
    await open(page, `/sites/${sites.find(s => s.name === 'Kelwick')!.id}`)
    const form = page.getByTestId('gauge-upload')
    await form.waitFor()
    const years = Array.from({ length: 30 }, (_, i) => 1990 + i)
    const rows = years.map(year => `${year},${(1.1 + (year - 1990) * 0.004).toFixed(3)}`)
    // The same year twice is refused with the row that repeats it.
    const bad = ['year,height', ...rows, `2000,1.150`].join('\n')
    await page.locator('#gauge-text').fill(bad)
    await form.getByRole('button', { name: 'Upload' }).click()
    const error = page.getByTestId('gauge-error')
    await error.waitFor()
    expect(plain(await error.textContent())).toMatch(/needs a change/)
    // The message under the field names the row and the year given twice.
    expect(plain(await page.locator('#gauge-msg').textContent())).toMatch(/Row 32.*2000/)
    expect(await page.locator('#gauge-text').inputValue()).toBe(bad)

    await page.locator('#gauge-text').fill(['year,height', ...rows].join('\n'))
    await form.getByRole('button', { name: 'Upload' }).click()
    const stored = page.getByTestId('gauge-stored')
    await stored.waitFor()
    expect(plain(await stored.textContent())).toMatch(/^Version 2 stored/)
    await expect.poll(async () => plain(await page.getByTestId('gauge-summary').textContent()))
      .toMatch(/30 .*1990.*2019/)
    expect(await page.getByTestId('gauge-error').count()).toBe(0)
  })
})
