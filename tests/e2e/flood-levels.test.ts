import { execFileSync } from 'node:child_process'
import { mkdtempSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { beforeEach, describe, expect, it } from 'vitest'
import { PLANNER } from '../support/demo-users'
import { open, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

// Kelwick's sea wall crest (2.30 m above mean sea level 2020) is a flood level: the mean sea will not
// reach it, but the year's highest water often will. The page and the PDF must say how often the water
// reaches it, and never word it with the tiny chance that the mean sea passes it.
const suite = useBrowserSuite('flood-levels')
let page: Page
beforeEach(() => ({ page } = suite))

const plain = (text: string) => text.replace(/[\s\u00A0\u202F]+/g, ' ').trim()

describe('a flood level on the outlook page and in the briefing', () => {
  it('is worded by how often the water reaches it and over the wall\'s life, on the page and in the PDF', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const sites = await (await page.request.get('/api/sites')).json() as { id: string, name: string }[]
    const kelwick = sites.find(site => site.name === 'Kelwick')!.id
    const started = await page.request.post(`/api/sites/${kelwick}/outlooks`, {
      data: { scenario: 'SSP2-4.5', samples: 20_000, seed: 3 },
    })
    expect(started.ok(), await started.text()).toBe(true)
    const outlookId = (await started.json() as { id: string }).id

    await open(page, `/sites/${kelwick}/outlooks/${outlookId}`)
    const wall = page.getByTestId('headline-flood-level')
    await wall.waitFor()
    const card = plain(await wall.textContent() ?? '')
    expect(card).toMatch(/Sea wall crest — 2\.30 m/)
    expect(card).toMatch(
      /the water is expected to reach 2\.30 m above .* (times a year|once a year|once every [\d,.]+ years): an? [^.]*chance in any one year/,
    )
    expect(card).toMatch(
      /Built in 2031 for 50 years \(2031–2080\): a (\d+|more than 99) % chance \((likely|very likely|virtually certain|extremely likely|about as likely as not)\)/,
    )
    expect(card).toMatch(/design-life level/)
    expect(card).not.toMatch(/exceptionally unlikely|less than 1 % chance \(/)
    // The mean-sea-level threshold keeps its own wording.
    expect(plain((await page.getByTestId('headline-mean-sea-level').first().textContent()) ?? '')).toMatch(
      /mean sea level here will be more than 0\.50 m above/,
    )
    expect(await seriousAxeViolations(page), 'outlook page').toEqual([])

    const thresholdIds = (
      (await (await page.request.get(`/api/sites/${kelwick}`)).json()) as { thresholds: { id: string }[] }
    ).thresholds.map(th => th.id)
    const created = await page.request.post('/api/briefings', {
      data: { outlookId, title: 'Kelwick wall', thresholdIds, years: [2050, 2100] },
    })
    expect(created.ok(), await created.text()).toBe(true)
    const briefingId = (await created.json() as { id: string }).id
    const pdf = await page.request.get(`/api/briefings/${briefingId}/pdf`)
    expect(pdf.ok()).toBe(true)
    const file = join(mkdtempSync(join(tmpdir(), 'bw-flood-')), 'briefing.pdf')
    writeFileSync(file, await pdf.body())
    const text = plain(execFileSync('pdftotext', ['-enc', 'UTF-8', file, '-'], { encoding: 'utf8' }))
    const wallLines = text.split(/(?=Sea wall crest \(flood level)/).slice(1).map(part => part.slice(0, 260))
    expect(wallLines.length).toBeGreaterThan(0)
    for (const line of wallLines) expect(line).not.toMatch(/exceptionally unlikely/)
    expect(text).toMatch(
      /Sea wall crest \(flood level, 2\.30 m\): In 2050 the water is expected to reach 2\.30 m above/,
    )
    // The table cell wraps in the PDF, so only its start is on one line of text.
    expect(text).toMatch(/Flood level: the water reaches it in that/)
    expect(text).toMatch(/Heights are above Mean sea level 2020 at the Kelwick tide gauge \(illustrative\)/)
  })
})
