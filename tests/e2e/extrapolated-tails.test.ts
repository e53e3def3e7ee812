import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { beforeEach, describe, expect, it } from 'vitest'
import type { OutlookResult } from '../../shared/engine'
import { PLANNER } from '../support/demo-users'
import { open, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'
import { SITE_BODY } from '../support/matrix-fixtures'

// The demo's ocean-expansion and Greenland releases publish quantiles from 5 % to 95 % only. A height
// the rise passes with a 1 % chance rests on the rise's 99th percentile, beyond those levels: the
// releases do not describe that tail, so the number must carry the extrapolated mark and no
// calibrated likelihood word, on the page and in the PDF ([practice, DESIGN.md vocabulary "extrapolated"]).
const suite = useBrowserSuite('extrapolated-tails')
let page: Page
beforeEach(() => ({ page } = suite))

const plain = (text: string) => text.replace(/[\s\u00A0\u202F]+/g, ' ').trim()
/** Every IPCC calibrated likelihood word, English. */
const IPCC_WORD
  = /virtually certain|extremely likely|very likely|\blikely\b|about as likely as not|unlikely|exceptionally/
const MARK = /extrapolated: the releases do not describe this tail/
const OUTLOOK = { scenario: 'SSP2-4.5', samples: 20_000, seed: 11 }

async function outlookOf(siteId: string): Promise<{ id: string, result: OutlookResult }> {
  const started = await page.request.post(`/api/sites/${siteId}/outlooks`, { data: OUTLOOK })
  expect(started.ok(), await started.text()).toBe(true)
  const id = (await started.json() as { id: string }).id
  const read = await page.request.get(`/api/outlooks/${id}`)
  expect(read.ok()).toBe(true)
  return { id, result: (await read.json() as { result: OutlookResult }).result }
}

async function newSite(name: string, height: number) {
  const created = await page.request.post('/api/sites', {
    data: { ...SITE_BODY(name), thresholds: [{ label: 'Rare crest', height }] },
  })
  expect(created.ok(), await created.text()).toBe(true)
  return (await created.json() as { id: string }).id
}

describe('a 1 % exceedance outside every release\'s outermost level', () => {
  it('carries the extrapolated mark and no IPCC word on the page, in the API and in the PDF', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    // Two sites with the same place, science and seed draw the same rises: the second one's threshold
    // sits at the first one's 99th percentile of 2100, so the rise passes it with a chance of about 1 %.
    const first = await outlookOf(await newSite('Tail Point survey', 0.8))
    const year2100 = first.result.years.indexOf(2100)
    const p99 = first.result.byYear[year2100]!.percentiles.find(p => p.level === 0.99)!
    expect(p99.extrapolated, 'the 99th percentile rests beyond the 95 % levels').toBe(true)
    const height = Math.round(p99.value * 100) / 100

    const siteId = await newSite('Tail Point', height)
    const { id: outlookId, result } = await outlookOf(siteId)
    const chance = result.thresholds[0]!.byYear[year2100]!
    expect(chance.value).toBeGreaterThan(0.002)
    expect(chance.value).toBeLessThan(0.03)
    expect(chance.extrapolated, 'the API marks the chance').toBe(true)

    await open(page, `/sites/${siteId}/outlooks/${outlookId}`)
    const sentences = page.getByTestId('headline-sentence')
    await sentences.first().waitFor()
    const by2100 = (await sentences.allTextContents()).map(plain).find(sentence => sentence.includes('by 2100'))!
    expect(by2100).toMatch(/more than \d+\.\d\d m above Mean sea level 2020/)
    expect(by2100).toMatch(MARK)
    expect(by2100).not.toMatch(IPCC_WORD)
    expect(await page.locator('[data-testid="headline-sentence"][data-extrapolated="true"]').count()).toBeGreaterThan(0)
    // The tables of the charts mark their extrapolated numbers with * and say what it means.
    expect(plain((await page.getByTestId('extrapolated-note').first().textContent()) ?? '')).toMatch(
      /^\* Extrapolated: beyond the outermost level a release publishes\. The release does not describe that tail/,
    )
    expect(await seriousAxeViolations(page), 'outlook page').toEqual([])

    const thresholdIds = (
      (await (await page.request.get(`/api/sites/${siteId}`)).json()) as { thresholds: { id: string }[] }
    ).thresholds.map(th => th.id)
    const created = await page.request.post('/api/briefings', {
      data: { outlookId, title: 'Tail Point crest', thresholdIds, years: [2050, 2100] },
    })
    expect(created.ok(), await created.text()).toBe(true)
    const briefingId = (await created.json() as { id: string }).id
    const pdf = await page.request.get(`/api/briefings/${briefingId}/pdf`)
    expect(pdf.ok()).toBe(true)
    const file = join(mkdtempSync(join(tmpdir(), 'bw-tails-')), 'briefing.pdf')
    writeFileSync(file, await pdf.body())
    const text = plain(execFileSync('pdftotext', ['-enc', 'UTF-8', file, '-'], { encoding: 'utf8' }))
    const line2100 = text
      .split(/(?=Rare crest \()/)
      .map(part => part.slice(0, part.indexOf('by 2100.') + 8))
      .find(part => part.endsWith('by 2100.'))
    expect(line2100, 'the summary line for 2100').toBeDefined()
    expect(line2100).toMatch(MARK)
    expect(line2100).not.toMatch(IPCC_WORD)
    expect(text).toMatch(
      /\* Extrapolated: beyond the outermost level a release publishes\. The release does not describe that tail/,
    )
    expect(text).toMatch(/%\s?\*/)
  })
})
