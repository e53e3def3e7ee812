import { execFileSync } from 'node:child_process'
import { mkdir, mkdtemp, readdir, copyFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { PLANNER, READER } from '../support/demo-users'
import {
  isolatedContext,
  open,
  screenshot,
  seriousAxeViolations,
  signIn,
  SCREENSHOT_DIR,
  type Page,
} from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

// A briefing as its readers meet it: the findings first (page, shared page and PDF), a PDF whose
// tables keep their headers and rows together and whose live link opens for its reader, and charts
// that stay legible on a phone.
const suite = useBrowserSuite('briefing-reading')
let page: Page
beforeEach(() => ({ page } = suite))

let siteId: string
let outlookPath: string
let englishId: string
let spanishId: string
let shareToken: string

/** Text as a reader sees it: no-break spaces and line breaks are just spaces. */
const plain = (text: string) => text.replace(/[\s\u00A0\u202F]+/g, ' ').trim()
const CHANCE = String.raw`(?:\d+|less than 1|more than 99) % \((?:[a-z ]+|extrapolated: the releases do not describe this tail)\)`
const ODDS = /\b\d+ in \d+\b|1-in-|near certain/

beforeAll(async () => {
  const { context } = await isolatedContext(suite.browser, suite.server.url)
  const planner = await context.newPage()
  await signIn(planner, PLANNER.email, PLANNER.password)
  const sites = await (await planner.request.get('/api/sites')).json() as { id: string, name: string }[]
  siteId = sites.find(site => site.name === 'Kelwick')!.id
  const run = async (scenario: string) => {
    const response = await planner.request.post(`/api/sites/${siteId}/outlooks`, {
      data: { scenario, samples: 20_000 },
    })
    expect(response.ok(), await response.text()).toBe(true)
    return (await response.json() as { id: string }).id
  }
  const outlookId = await run('SSP2-4.5')
  outlookPath = `/sites/${siteId}/outlooks/${outlookId}`
  const comparison = await run('SSP5-8.5')
  const thresholdIds = (
    (await (await planner.request.get(`/api/sites/${siteId}`)).json()) as { thresholds: { id: string }[] }
  ).thresholds.map(th => th.id)
  const issue = async (language: string) => {
    const created = await planner.request.post('/api/briefings', {
      data: {
        outlookId,
        comparisonOutlookIds: [comparison],
        title: `Kelwick (${language})`,
        audience: 'Council',
        language,
        thresholdIds,
        years: [2050, 2100],
      },
    })
    const { id } = await created.json() as { id: string }
    expect((await planner.request.post(`/api/briefings/${id}/issue`)).ok()).toBe(true)
    return id
  }
  englishId = await issue('en')
  spanishId = await issue('es')
  shareToken = (
    (await (await planner.request.post(`/api/briefings/${englishId}/share`)).json()) as { shareToken: string }
  ).shareToken
  await context.close()
})

async function findings(on: Page) {
  const list = on.getByTestId('summary-findings')
  await list.waitFor()
  return (await list.locator('li').allTextContents()).map(plain)
}

describe('the first page a councillor reads', () => {
  for (const width of [390, 1366]) {
    it(`leads with three findings, one sentence each, then thresholds × years, at ${width} px, signed in and shared`, async () => {
      await page.setViewportSize({ width, height: 900 })
      await signIn(page, READER.email, READER.password)
      for (const [where, path] of [
        ['page', `/briefings/${englishId}`],
        ['shared', `/shared/${shareToken}`],
      ] as const) {
        await open(page, path)
        const [key, trigger, spread, ...more] = await findings(page)
        expect(more).toEqual([])
        expect(key).toMatch(
          new RegExp(
            `^Under SSP2-4\\.5, the chance that the mean sea level at Kelwick rises above “[^”]+” \\([\\d.]+ m\\) is ${CHANCE} by 2050 and ${CHANCE} by 2100\\.$`,
          ),
        )
        expect(trigger).toMatch(
          /^The chance of passing “[^”]+” (reaches 10 %, the chance this briefing plans to, in \d{4}: its trigger year|stays below 10 %, the chance this briefing plans to, up to \d{4}, the last year computed)\.$/,
        )
        expect(spread).toMatch(
          new RegExp(
            `^Across the 2 scenarios compared, that chance by 2100 (runs from ${CHANCE} under SSP[\\d.-]+ to ${CHANCE} under SSP[\\d.-]+|is ${CHANCE} under each)\\.$`,
          ),
        )
        // Each chance is said once, one way: never the odds beside the number and the word.
        const summary = plain((await page.getByTestId('briefing-summary').textContent()) ?? '')
        expect(summary).not.toMatch(ODDS)
        // Then thresholds × years under the briefing's scenario only; the full detail follows in section 3.
        const grid = page.getByTestId('summary-grid')
        expect((await grid.locator('thead th').allTextContents()).map(plain)).toEqual(['Threshold', '2050', '2100'])
        expect(await grid.locator('tbody tr').count()).toBe(2)
        expect(plain((await grid.locator('caption').textContent()) ?? '')).toMatch(
          /^Chance under SSP2-4\.5 that the mean sea level is above each threshold/,
        )
        expect(await page.getByTestId('detail-lines').locator('li').count()).toBeGreaterThan(2)
        // Who issues it, who wrote it, and what the heights are measured from.
        expect(plain((await page.getByTestId('briefing-issuer').textContent()) ?? '')).toBe(
          `Issued by Caldwyn Coast Regional Council · ${PLANNER.name}`,
        )
        expect(plain((await page.getByTestId('briefing-heights').textContent()) ?? '')).toMatch(
          /^Heights in metres above .+\.$/,
        )
        // On a laptop the findings are on the first screen.
        if (width === 1366) expect((await page.getByTestId('summary-findings').boundingBox())!.y).toBeLessThan(900)
        expect(await seriousAxeViolations(page), `${where} at ${width} px`).toEqual([])
        await screenshot(page, `briefing-reading-${where}-${width}`)
      }
    })
  }

  it('says the findings in Spanish, with the number after "de" and "a" as Spanish writes it', async () => {
    await signIn(page, READER.email, READER.password)
    await open(page, `/briefings/${spanishId}`)
    const [key, trigger, spread] = await findings(page)
    const chance = String.raw`(?:del \d+|de menos del 1|de más del 99) % \((?:[a-zá-úñ ]+|extrapolada: las versiones publicadas no describen esta cola)\)`
    expect(key).toMatch(
      new RegExp(
        `^En el escenario SSP2-4\\.5, la probabilidad de que el nivel medio del mar en Kelwick supere «[^»]+» \\([\\d,]+ m\\) es ${chance} para 2050 y ${chance} para 2100\\.$`,
      ),
    )
    expect(trigger).toMatch(
      /^La probabilidad de superar «[^»]+» (alcanza el 10 %.+en \d{4}: es su año de activación|se mantiene por debajo del 10 %.+hasta \d{4}, el último año calculado)\.$/,
    )
    expect(spread).toMatch(
      /^En los 2 escenarios comparados, esa probabilidad para 2100 (va (del|de menos del|de más del) .+ con SSP[\d.-]+ (al|a menos del|a más del) .+ con SSP[\d.-]+|es .+ en todos)\.$/,
    )
    expect(plain((await page.getByTestId('briefing-heights').textContent()) ?? '')).toMatch(
      /^Alturas en metros sobre .+\.$/,
    )
    await screenshot(page, 'briefing-reading-spanish')
  })
})

describe('the live page a briefing points to', () => {
  it('is the share link on the shared page, and the page inside (with a sign-in note) for a reader', async () => {
    await open(page, `/shared/${shareToken}`)
    expect(await page.getByTestId('live-link').getAttribute('href')).toBe(`${suite.server.url}/shared/${shareToken}`)
    expect(await page.getByTestId('live-link-sign-in').count()).toBe(0)

    await signIn(page, READER.email, READER.password)
    await open(page, `/briefings/${englishId}`)
    // Readers never get the share link itself: only planners hand it on.
    expect(await page.getByTestId('live-link').getAttribute('href')).toBe(`${suite.server.url}/briefings/${englishId}`)
    expect(plain((await page.getByTestId('live-link-sign-in').textContent()) ?? '')).toBe(
      'Opens only after signing in with an account of Caldwyn Coast Regional Council.',
    )

    await suite.freshContext().then(fresh => (page = fresh))
    await signIn(page, PLANNER.email, PLANNER.password)
    await open(page, `/briefings/${englishId}`)
    expect(await page.getByTestId('live-link').getAttribute('href')).toBe(`${suite.server.url}/shared/${shareToken}`)
  })
})

/** One page's text, in reading order. */
const pageText = (file: string, n: number) =>
  execFileSync('pdftotext', ['-enc', 'UTF-8', '-f', String(n), '-l', String(n), '-layout', file, '-'], {
    encoding: 'utf8',
  })

describe('the PDF', () => {
  it('leads with the findings, names who issued it and the datum, links where its reader can open, and never orphans a table header or row', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const folder = await mkdtemp(join(tmpdir(), 'brinkwater-pdf-'))
    try {
      const pdfs = {
        // Not shared: the page inside, which needs a sign-in, and says so.
        inside: await page.request.get(`/api/briefings/${spanishId}/pdf`),
        shared: await page.request.get(`/api/shared/${shareToken}/pdf?paper=letter`),
      }
      for (const [name, response] of Object.entries(pdfs)) {
        expect(response.status()).toBe(200)
        const file = join(folder, `${name}.pdf`)
        await writeFile(file, await response.body())
        const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [file], { encoding: 'utf8' }))![1])
        const texts = Array.from({ length: pages }, (_, i) => pageText(file, i + 1))
        const all = plain(texts.join('\n'))

        // Page 1 carries the findings and the compact table before anything for the engineer.
        const first = plain(texts[0]!)
        if (name === 'shared') {
          expect(first).toMatch(/Under SSP2-4\.5, the chance that the mean sea level at Kelwick rises above/)
          expect(first).toMatch(/Across the 2 scenarios compared/)
          expect(first).toContain('Issued by Caldwyn Coast Regional Council')
          expect(first).toMatch(/Heights in metres above /)
          expect(all).toContain(`${suite.server.url}/shared/${shareToken}`)
          expect(all).not.toMatch(/Opens only after signing in/)
        }
        else {
          expect(first).toMatch(
            /En el escenario SSP2-4\.5, la probabilidad de que el nivel medio del mar en Kelwick supere/,
          )
          expect(first).toMatch(/Alturas en metros sobre /)
          expect(all).toContain(`${suite.server.url}/briefings/${spanishId}`)
          expect(all).toContain('Solo se abre tras iniciar sesión con una cuenta de Caldwyn Coast Regional Council.')
        }
        expect(all).toContain(PLANNER.name)
        expect(all).not.toMatch(ODDS)
        // What the outlook did, never "keeping their published correlations" beside "sampled as independent".
        expect(all).not.toMatch(/published correlations|correlaciones publicadas\)/)
        expect(all).toMatch(
          /sampled as independent|se muestrearon como independientes|sampled with the correlations published|se muestrearon con las correlaciones publicadas/,
        )

        // A table's header is never the last thing on a page, and every row sits under its header on its page.
        const headers
          = name === 'shared'
            ? [
                /^\s*Scenario\s+Threshold\s+Chance of/,
                /^\s*Source of rise\s+Scenario\s+Version/,
                /^\s*Threshold\s+2050\s+2100\s*$/,
                /^\s*Year\s+Allowance/,
              ]
            : [
                /^\s*Escenario\s+Umbral\s+Probabilidad de/,
                /^\s*Fuente de subida\s+Escenario\s+Versión/,
                /^\s*Umbral\s+2050\s+2100\s*$/,
                /^\s*Año\s+Margen/,
              ]
        const footer = /^\s*(Página|Page) \d+ (de|of) \d+\s*$|Caldwyn Coast Regional Council · /
        for (const [i, text] of texts.entries()) {
          const lines = text.split('\n').filter(line => line.trim() && !footer.test(line))
          const last = lines.at(-1) ?? ''
          for (const header of headers)
            expect(header.test(last), `${name} page ${i + 1} ends with a table header: ${last}`).toBe(false)
          const releaseRow = lines.findIndex(line =>
            /^\s*(Ocean warming|Glaciers|Calentamiento del océano|Glaciares)\s/.test(line),
          )
          if (releaseRow >= 0)
            expect(
              lines.slice(0, releaseRow).some(line => headers[1]!.test(line)),
              `${name} page ${i + 1}: release rows without their header`,
            ).toBe(true)
        }

        // One image per page, kept beside the screenshots for a person to look at.
        execFileSync('pdftoppm', ['-png', '-r', '60', file, join(folder, name)])
        const images = (await readdir(folder)).filter(image => image.startsWith(name) && image.endsWith('.png')).sort()
        expect(images).toHaveLength(pages)
        await mkdir(SCREENSHOT_DIR, { recursive: true })
        for (const [i, image] of images.entries())
          await copyFile(join(folder, image), resolve(SCREENSHOT_DIR, `briefing-reading-pdf-${name}-${i + 1}.png`))
      }
    }
    finally {
      await rm(folder, { recursive: true, force: true })
    }
  })
})

/** Boxes of the chart's drawn words that overlap one another (legend, axis labels, threshold names). */
async function overlappingTexts(on: Page, chart: string) {
  const svg = on.getByTestId(chart).locator('svg').first()
  await svg.waitFor()
  return svg.evaluate((root) => {
    const boxes = [...root.querySelectorAll('text')]
      // A scrolling legend's pager ("1/2") sits over the names it has scrolled out of view.
      .filter(
        node =>
          node.textContent?.trim()
          && !/^\d+\/\d+$/.test(node.textContent.trim())
          && getComputedStyle(node).opacity !== '0'
          && node.getAttribute('opacity') !== '0',
      )
      .map(node => ({ text: node.textContent!.trim(), box: node.getBoundingClientRect() }))
      .filter(({ box }) => box.width > 0 && box.height > 0)
    const clashes: string[] = []
    for (const [i, a] of boxes.entries()) {
      for (const b of boxes.slice(i + 1)) {
        const x = Math.min(a.box.right, b.box.right) - Math.max(a.box.left, b.box.left)
        const y = Math.min(a.box.bottom, b.box.bottom) - Math.max(a.box.top, b.box.top)
        if (x > 1 && y > 1) clashes.push(`${a.text} × ${b.text}`)
      }
    }
    return clashes
  })
}

/** The numbers an axis labels, left to right: they must be whole steps of 1, 2 or 5 times a power of ten. */
function expectRoundSteps(labels: number[], what: string) {
  expect(labels.length, what).toBeGreaterThan(1)
  const step = labels[1]! - labels[0]!
  const digit = Number(step.toExponential(6).charAt(0))
  expect([1, 2, 5], `${what}: step ${step}`).toContain(digit)
  for (const value of labels)
    expect(Math.abs(value / step - Math.round(value / step)), `${what}: ${labels.join(', ')}`).toBeLessThan(1e-6)
}

/**
 * A year axis starts at the first year's decade (an outlook from 2020 starts at 2020, not 2000) and
 * labels round steps after it: the first label is a whole decade, the last is the axis end, and the
 * labels between are whole steps of 1, 2 or 5 times a power of ten.
 */
function expectYearLabels(labels: number[], what: string) {
  expect(labels.length, what).toBeGreaterThan(2)
  expect(labels[0]! % 10, `${what}: ${labels.join(', ')}`).toBe(0)
  expectRoundSteps(labels.slice(1, -1).length > 1 ? labels.slice(1, -1) : labels.slice(1), what)
}

describe('charts on a phone and a laptop', () => {
  for (const width of [390, 1366]) {
    it(`keep their words apart and their axes on round numbers at ${width} px`, async () => {
      await page.setViewportSize({ width, height: 900 })
      await signIn(page, PLANNER.email, PLANNER.password)
      await open(page, outlookPath)
      for (const chart of ['exceedance-chart', 'fan-chart'])
        expect(await overlappingTexts(page, chart), `${chart} at ${width} px`).toEqual([])
      // The exceedance chart's heights, e.g. 0.2 … 1.4 m; the fan's years, e.g. 2020, 2050 … 2150.
      const labels = async (chart: string, pattern: RegExp) =>
        (await page.getByTestId(chart).locator('svg text').allTextContents())
          .map(text => plain(text))
          .filter(text => pattern.test(text))
          .map(Number)
      expectRoundSteps(
        (await labels('exceedance-chart', /^-?\d+(\.\d+)?$/)).filter((v, i, all) => all.indexOf(v) === i),
        'exceedance heights',
      )
      expectYearLabels(await labels('fan-chart', /^\d{4}$/), 'fan years')
      await screenshot(page, `briefing-reading-site-charts-${width}`)

      await open(page, `/briefings/${englishId}`)
      expect(await overlappingTexts(page, 'chart-exceedance'), `briefing exceedance at ${width} px`).toEqual([])
      const years = (await page.getByTestId('chart-fan').locator('svg text').allTextContents())
        .map(plain)
        .filter(text => /^\d{4}$/.test(text))
        .map(Number)
      expectYearLabels(years, 'briefing fan years')
    })
  }
})
