import { execFileSync } from 'node:child_process'
import { mkdirSync, writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { beforeEach, describe, expect, it } from 'vitest'
import { PLANNER } from '../support/demo-users'
import { SCREENSHOT_DIR, open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

// A briefing that includes Kelwick's adaptation pathway and a decision record: the checkbox on the
// form (and its reason where a site has no pathway), the section on the briefing page, frozen once
// issued, on the shared page, and in the PDF with its chart and tables.
const suite = useBrowserSuite('briefing-pathways')
let page: Page
beforeEach(() => ({ page } = suite))

const plain = (text: string) => text.replace(/[\s\u00A0\u202F]+/g, ' ').trim()
const json = async <T>(response: { ok: () => boolean, text: () => Promise<string>, json: () => Promise<unknown> }) => {
  expect(response.ok(), await response.text()).toBe(true)
  return await response.json() as T
}

describe('a briefing with the site\'s pathways', () => {
  it('is chosen on the form, frozen when issued, shown on the shared page and laid out in the PDF', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const sites = await json<Array<{ id: string, name: string }>>(await page.request.get('/api/sites'))
    const kelwick = sites.find(site => site.name === 'Kelwick')!.id
    const outlooks: Record<string, string> = {}
    for (const scenario of ['SSP2-4.5', 'SSP5-8.5']) {
      outlooks[scenario] = (await json<{ id: string }>(await page.request.post(`/api/sites/${kelwick}/outlooks`, {
        data: { scenario, samples: 10_000, seed: 6 },
      }))).id
    }
    const view = await json<{ pathways: Array<{ id: string, measureIds: string[] }> }>(
      await page.request.get(`/api/sites/${kelwick}/pathways`),
    )
    const recorded = await json<{ outlookInputHash: string }>(await page.request.post(`/api/sites/${kelwick}/decisions`, {
      data: {
        pathwayId: view.pathways[0]!.id,
        measureId: view.pathways[0]!.measureIds[1],
        scenario: 'SSP2-4.5',
        tolerance: 0.1,
        rationale: 'Council resolution 12/2026 (illustrative).',
        reviewDate: '2036-01-31',
      },
    }))

    // With a decision record the section is offered and ticked.
    await open(page, `/briefings/new?outlookId=${outlooks['SSP2-4.5']}`)
    const box = page.getByTestId('form-include-pathways')
    expect(await box.isChecked()).toBe(true)
    expect(plain(await page.getByTestId('form-pathways-help').textContent() ?? '')).toMatch(
      /This site has one pathway and one decision record\./,
    )
    expect(await seriousAxeViolations(page), 'issue form').toEqual([])
    await page.getByTestId('form-submit').click()
    await page.waitForURL(url => /^\/briefings\/[0-9a-f-]{36}$/.test(url.pathname))
    const briefingId = new URL(page.url()).pathname.split('/').pop()!
    const section = page.getByTestId('briefing-pathways')
    await section.waitFor()
    expect(plain(await page.getByTestId('briefing-pathways-as-of').textContent() ?? '')).toMatch(/^As they stand now/)

    await page.getByTestId('issue-briefing').click()
    await page.getByTestId('issue-confirm-button').click()
    await expect.poll(async () => plain(await page.getByTestId('briefing-pathways-as-of').textContent() ?? ''), {
      timeout: 15_000,
    }).toMatch(/^As they stood on .+\d{4}: tipping and decision years/)
    const spread = plain(await section.getByTestId('briefing-pathway-spread').first().textContent() ?? '')
    expect(spread).toMatch(/Decide on Raise the quay wall by 0\.4 m (between \d{4} \(SSP\d-\d\.\d\) and \d{4}|by \d{4})/)
    // Three steps, two scenarios: a row each in the table beside the chart.
    expect(await section.getByTestId('briefing-pathway-table').first().locator('tbody tr').count()).toBe(3 * 2)
    expect(await section.locator('img[alt^="Pathways chart"]').count()).toBe(2)
    expect(plain(await section.getByTestId('briefing-decision-records').textContent() ?? '')).toMatch(
      /Council resolution 12\/2026 \(illustrative\)\.\s?Rests on outlook \w{16,}; .+ v\d/,
    )
    expect(await seriousAxeViolations(page), 'issued briefing with pathways').toEqual([])
    await section.scrollIntoViewIfNeeded()
    await screenshot(page, 'briefing-pathways-section')

    const pdf = await page.request.get(`/api/briefings/${briefingId}/pdf`)
    expect(pdf.ok()).toBe(true)
    mkdirSync(SCREENSHOT_DIR, { recursive: true })
    const file = resolve(SCREENSHOT_DIR, 'briefing-pathways.pdf')
    writeFileSync(file, await pdf.body())
    const text = plain(execFileSync('pdftotext', ['-enc', 'UTF-8', file, '-'], { encoding: 'utf8' }))
    expect(text).toContain('Adaptation pathways and decisions')
    expect(text).toMatch(/As they stood on .+: tipping and decision years/)
    expect(text).toMatch(/Decide on Raise the quay wall by 0\.4 m/)
    expect(text).toContain('Quay district: hold the line, then retreat')
    expect(text).toContain('Council resolution 12/2026')
    // Columns interleave in the extracted text: the words and the hash, each on its own.
    expect(text).toContain('Rests on outlook')
    expect(text).toContain(recorded.outlookInputHash)
    expect(text).toContain('projections, not predictions')
    // The briefing's own cautions stay.
    expect(text).toContain('Projections are not predictions')
    execFileSync('pdftoppm', ['-png', '-r', '60', file, resolve(SCREENSHOT_DIR, 'briefing-pathways-pdf')])

    const { shareToken } = await json<{ shareToken: string }>(
      await page.request.post(`/api/briefings/${briefingId}/share`),
    )
    const reader = await suite.freshContext()
    await open(reader, `/shared/${shareToken}`)
    const shared = reader.getByTestId('briefing-pathways')
    await shared.waitFor()
    expect(plain(await shared.textContent() ?? '')).toContain('Council resolution 12/2026')
    expect(await seriousAxeViolations(reader), 'shared briefing with pathways').toEqual([])
  })

  it('is unavailable, with the reason, for a site without a pathway', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const sites = await json<Array<{ id: string, name: string }>>(await page.request.get('/api/sites'))
    const other = sites.find(site => site.name !== 'Kelwick')!.id
    const outlook = await json<{ id: string }>(await page.request.post(`/api/sites/${other}/outlooks`, {
      data: { scenario: 'SSP2-4.5', samples: 2_000 },
    }))
    await open(page, `/briefings/new?outlookId=${outlook.id}`)
    const box = page.getByTestId('form-include-pathways')
    expect(await box.isDisabled()).toBe(true)
    expect(await box.isChecked()).toBe(false)
    expect(plain(await page.getByTestId('form-pathways-help').textContent() ?? '')).toMatch(
      /^Not available: this site has no adaptation pathway yet\./,
    )
    expect(await seriousAxeViolations(page), 'issue form without pathways').toEqual([])
  })
})
