import { execFileSync } from 'node:child_process'
import { copyFile, mkdir, mkdtemp, readdir, readFile, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { PLANNER, READER } from '../support/demo-users'
import {
  isolatedContext,
  open,
  launchBrowser,
  screenshot,
  seriousAxeViolations,
  signIn,
  SCREENSHOT_DIR,
  type Browser,
  type BrowserContext,
  type Page,
} from '../support/browser'
import { startServer, type RunningServer } from '../support/server'

let server: RunningServer
let browser: Browser
let context: BrowserContext
let external: string[]
let cspViolations: string[]
let page: Page
let outlookId: string
/** An issued briefing made through the API, for the tests that read one rather than make one. */
let issuedId: string

const UUID = /[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}/
const SECTIONS = [
  '1. Summary',
  '2. Charts',
  '3. Chances by year',
  '4. What this rests on',
  '5. What this is not',
  '6. About this document',
]

async function startSession(email: string, password: string) {
  await context.close()
  expect(cspViolations, 'content security policy violations').toEqual([])
  ;({ context, external, cspViolations } = await isolatedContext(browser, server.url))
  page = await context.newPage()
  await signIn(page, email, password)
}

beforeAll(async () => {
  server = await startServer()
  browser = await launchBrowser()
  // The server starts without precomputed outlooks: compute two (one to compare) as the planner.
  const setup = await isolatedContext(browser, server.url)
  const planner = await setup.context.newPage()
  await signIn(planner, PLANNER.email, PLANNER.password)
  const sites = await (await planner.request.get('/api/sites')).json() as { id: string, name: string }[]
  const kelwick = sites.find(site => site.name === 'Kelwick')!.id
  const run = async (scenario: string) => {
    const response = await planner.request.post(`/api/sites/${kelwick}/outlooks`, {
      data: { scenario, samples: 20_000 },
    })
    expect(response.ok(), await response.text()).toBe(true)
    return (await response.json() as { id: string }).id
  }
  outlookId = await run('SSP2-4.5')
  await run('SSP5-8.5')
  const thresholds = (
    (await (await planner.request.get(`/api/sites/${kelwick}`)).json()) as { thresholds: { id: string }[] }
  ).thresholds.map(th => th.id)
  const created = await planner.request.post('/api/briefings', {
    data: {
      outlookId,
      title: 'Kelwick: the sea to 2100',
      audience: 'Council',
      thresholdIds: thresholds,
      years: [2050, 2100],
    },
  })
  issuedId = (await created.json() as { id: string }).id
  expect((await planner.request.post(`/api/briefings/${issuedId}/issue`)).ok()).toBe(true)
  await setup.context.close()
  expect(setup.external).toEqual([])
  expect(setup.cspViolations).toEqual([])
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
})
beforeEach(async () => {
  ({ context, external, cspViolations } = await isolatedContext(browser, server.url))
  page = await context.newPage()
})
// Screenshots are kept for every failure (and for every test with BRINKWATER_SCREENSHOTS=all).
afterEach(async (ctx) => {
  if (ctx.task.result?.state === 'fail' || process.env.BRINKWATER_SCREENSHOTS === 'all')
    await screenshot(page, `briefings-${ctx.task.name}`)
  await context.close()
  expect(external, 'requests that left the app').toEqual([])
  expect(cspViolations, 'content security policy violations').toEqual([])
})

// Steps worth looking at by eye, kept only when every screenshot is asked for.
const snap = (on: Page, name: string) =>
  process.env.BRINKWATER_SCREENSHOTS === 'all' ? screenshot(on, `briefings-step-${name}`) : undefined
const noAxeFaults = async (on: Page, where: string) => expect(await seriousAxeViolations(on), where).toEqual([])
/** Text as a reader sees it: no-break spaces and line breaks are just spaces. */
const plain = (text: string) => text.replace(/[\s\u00A0\u202F]+/g, ' ').trim()

async function downloadPdf(on: Page, testid: string) {
  const [download] = await Promise.all([on.waitForEvent('download'), on.getByTestId(testid).click()])
  const folder = await mkdtemp(join(tmpdir(), 'brinkwater-pdf-'))
  const file = join(folder, download.suggestedFilename())
  await download.saveAs(file)
  return { name: download.suggestedFilename(), file, folder }
}

describe('issuing and sharing a briefing', () => {
  it('a planner drafts, issues, downloads and shares a briefing that a signed-out visitor reads until the link is revoked', async () => {
    await startSession(PLANNER.email, PLANNER.password)
    await open(page, `/briefings/new?outlookId=${outlookId}`)
    await noAxeFaults(page, 'issue form')
    const form = page.getByTestId('briefing-form')
    expect(await form.getByLabel('2050', { exact: true }).isChecked()).toBe(true)
    expect(await form.getByLabel('2100', { exact: true }).isChecked()).toBe(true)
    await form.getByLabel('Title', { exact: true }).fill('Kelwick harbour: sea level to 2100')
    await form.getByLabel('Prepared for (optional)').fill('Harbour committee')
    await form.getByLabel('Local context (optional)').fill('Quay Street floods at spring tides. <b>bold?</b>')
    await form.getByRole('checkbox', { name: /SSP5-8\.5/ }).check()
    await snap(page, 'form')
    await form.getByRole('button', { name: 'Save as draft' }).click()
    await page.waitForURL(url => UUID.test(url.pathname) && url.pathname.startsWith('/briefings/'))
    const briefingPath = new URL(page.url()).pathname

    // The planner's text shows as typed, never as markup.
    expect(await page.getByTestId('local-context').textContent()).toBe(
      'Quay Street floods at spring tides. <b>bold?</b>',
    )
    expect(await page.getByTestId('local-context').locator('b').count()).toBe(0)
    expect(await page.getByTestId('draft-banner').textContent()).toMatch(/DRAFT — not issued/)
    expect(await page.getByTestId('briefing-illustrative').textContent()).toMatch(/Illustrative demo data/)
    expect(
      plain(
        await page
          .getByTestId('briefing-document')
          .locator('h2')
          .allTextContents()
          .then(all => all.join('|')),
      ),
    ).toBe(SECTIONS.join('|'))
    // The compared scenario has its own rows in the table of chances.
    expect(
      await page.getByTestId('chances-table').locator('tbody tr', { hasText: 'SSP5-8.5' }).count(),
    ).toBeGreaterThan(0)
    await page.getByTestId('chart-exceedance').locator('svg').first().waitFor()
    await noAxeFaults(page, 'draft briefing')
    await snap(page, 'draft')

    await page.getByTestId('issue-briefing').click()
    expect(await page.getByTestId('issue-confirm').textContent()).toMatch(/never changes/)
    await page.getByTestId('issue-confirm-button').click()
    await page.getByTestId('new-version').waitFor()
    expect(await page.getByTestId('draft-banner').count()).toBe(0)

    const pdf = await downloadPdf(page, 'pdf-a4')
    expect(pdf.name).toMatch(/^brinkwater-kelwick-ssp2-4\.5-v\d+-\d{4}-\d{2}-\d{2}\.pdf$/)
    expect((await readFile(pdf.file)).subarray(0, 5).toString()).toBe('%PDF-')
    await rm(pdf.folder, { recursive: true })

    await context.grantPermissions(['clipboard-read', 'clipboard-write'])
    await page.getByTestId('share-create').click()
    const shareUrl = await page.getByTestId('share-url').inputValue()
    expect(shareUrl).toMatch(new RegExp(`^${server.url}/shared/[\\w-]{20,}$`))
    await page.getByTestId('share-copy').click()
    await expect.poll(() => page.getByTestId('share-status').textContent()).toMatch(/Link copied|select/)
    await noAxeFaults(page, 'issued briefing with its share link')
    await snap(page, 'issued')

    // Someone without an account opens the link in a browser of their own.
    const visitor = await isolatedContext(browser, server.url)
    const reader = await visitor.context.newPage()
    expect((await open(reader, shareUrl))?.status()).toBe(200)
    expect(await reader.getByTestId('briefing-title').textContent()).toBe('Kelwick harbour: sea level to 2100')
    expect(await reader.getByTestId('shared-note').textContent()).toMatch(/shared read-only copy/)
    expect(await reader.getByTestId('local-context').textContent()).toContain('<b>bold?</b>')
    expect(await reader.getByTestId('briefing-toolbar').count()).toBe(0)
    await noAxeFaults(reader, 'shared page')
    await snap(reader, 'shared')
    // Later visits are served from the page cache with a fresh nonce, gzip-encoded: the page still hydrates and the
    // policy blocks nothing. (The first visit set the language cookie, so the second renders once more.)
    await open(reader, shareUrl)
    const cached = await open(reader, shareUrl)
    expect(cached?.headers()['x-page-cache']).toBe('hit')
    // Compressed once when stored, with the fresh nonce spliced in: the browser inflates it as any page.
    expect(cached?.headers()['content-encoding']).toBe('gzip')
    expect(await reader.getByTestId('briefing-title').textContent()).toBe('Kelwick harbour: sea level to 2100')
    expect(visitor.cspViolations, 'content security policy violations on the shared page').toEqual([])

    await page.getByTestId('share-revoke').click()
    await expect.poll(() => page.getByTestId('share-status').textContent()).toMatch(/revoked/)
    expect((await reader.reload())?.status()).toBe(404)
    await reader.waitForSelector('html[data-hydrated="true"]')
    expect(await reader.getByTestId('shared-gone').textContent()).toMatch(/not available.*withdrawn/s)
    await noAxeFaults(reader, 'revoked link')
    await snap(reader, 'revoked')
    await visitor.context.close()
    expect(visitor.external).toEqual([])
    expect(visitor.cspViolations).toEqual([])

    await open(page, '/briefings')
    const row = page.getByTestId(`briefing-row-${briefingPath.split('/').pop()}`)
    expect(plain((await row.textContent()) ?? '')).toMatch(
      /Kelwick harbour: sea level to 2100.*Kelwick.*Issued.*Organisation only/,
    )
    await noAxeFaults(page, 'briefing list')
  })

  it('a reader finds the issued briefing in the navigation and reads it without the planner toolbar', async () => {
    await startSession(READER.email, READER.password)
    await page.getByTestId('main-nav').getByRole('link', { name: 'Briefings' }).click()
    await page.waitForURL('**/briefings')
    await page.getByRole('link', { name: 'Kelwick: the sea to 2100' }).click()
    await page.waitForURL(`**/briefings/${issuedId}`)
    await page.getByTestId('briefing-document').waitFor()
    const toolbar = page.getByTestId('briefing-toolbar')
    expect(await toolbar.getByRole('button').count()).toBe(0)
    expect(await toolbar.getByRole('link').allTextContents()).toEqual(['PDF (A4)', 'PDF (US Letter)'])
    expect(await page.getByTestId('share').count()).toBe(0)
    await noAxeFaults(page, 'briefing for a reader')
  })
})

describe('the PDF', () => {
  it('says what the page says: every section, the thresholds, the chances, the cautions and the input hash, in the embedded font', async () => {
    await startSession(PLANNER.email, PLANNER.password)
    await open(page, `/briefings/${issuedId}`)
    const cells = (await page.getByTestId('chances-table').locator('tbody td').allTextContents())
      .map(plain)
      .filter(text => /%$/.test(text))
    const thresholds = (await page.getByTestId('chances-table').locator('tbody th').allTextContents()).map(plain)
    const hash = plain((await page.getByTestId('input-hash').first().textContent()) ?? '').split(': ')[1]!
    expect(cells.length).toBeGreaterThan(0)
    expect(hash).toMatch(/^\w{16,}$/)

    const pdf = await downloadPdf(page, 'pdf-letter')
    try {
      const text = plain(execFileSync('pdftotext', ['-enc', 'UTF-8', pdf.file, '-'], { encoding: 'utf8' }))
      for (const heading of SECTIONS) expect(text).toContain(heading)
      for (const label of thresholds) expect(text).toContain(label)
      for (const chance of cells) expect(text).toContain(chance)
      expect(text).toContain('Projections are not predictions')
      expect(text).toContain('not engineering or legal advice')
      expect(text).toContain(hash)

      const fonts = execFileSync('pdffonts', [pdf.file], { encoding: 'utf8' })
        .split('\n')
        .filter(line => line.includes('AtkinsonHyperlegible'))
      expect(fonts.length).toBeGreaterThan(0)
      // Columns after the name and type: encoding, emb, sub, uni, object, generation.
      for (const line of fonts) expect(line, line).toMatch(/\s(yes)\s+(yes|no)\s+(yes|no)\s+\d+\s+\d+\s*$/)

      // One image per page, kept beside the screenshots for a person to look at.
      const pages = Number(/Pages:\s+(\d+)/.exec(execFileSync('pdfinfo', [pdf.file], { encoding: 'utf8' }))![1])
      execFileSync('pdftoppm', ['-png', '-r', '60', pdf.file, join(pdf.folder, 'page')])
      const images = (await readdir(pdf.folder)).filter(name => name.endsWith('.png')).sort()
      expect(images).toHaveLength(pages)
      await mkdir(SCREENSHOT_DIR, { recursive: true })
      for (const [i, name] of images.entries())
        await copyFile(join(pdf.folder, name), resolve(SCREENSHOT_DIR, `briefing-pdf-page-${i + 1}.png`))
    }
    finally {
      await rm(pdf.folder, { recursive: true, force: true })
    }
  })
})
