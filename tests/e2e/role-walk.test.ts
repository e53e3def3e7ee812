import { beforeEach, describe, expect, it } from 'vitest'
import { ADMIN, ANALYST, OPERATOR, PLANNER, READER } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

// Every role, in English and in Spanish, through the pages its navigation offers (and the ones
// a role reaches from them): nothing written to the console as an error, no script error, no
// serious accessibility fault, and a header that keeps to its two rows on a laptop.
const suite = useBrowserSuite('role-walk')
let page: Page
beforeEach(() => ({ page } = suite))

const ROLES = { reader: READER, planner: PLANNER, analyst: ANALYST, admin: ADMIN, operator: OPERATOR }

/** Pages a role reaches beyond its navigation: a record's own page, a form. */
async function furtherPages(role: string, on: Page): Promise<string[]> {
  const json = async <T>(path: string) => (await on.request.get(path)).json() as Promise<T>
  if (role === 'planner') {
    const [site] = await json<{ id: string }[]>('/api/sites')
    return [`/sites/${site!.id}`, '/sites/new']
  }
  if (role === 'reader') {
    const [site] = await json<{ id: string }[]>('/api/sites')
    return [`/sites/${site!.id}`]
  }
  if (role === 'analyst') return ['/library/new', '/library/correlation-sets/new', '/library/scale-factor-grids/new']
  return []
}

/** Whether the items of a row of the header sit on one line: every one overlaps the others in height. */
async function oneLine(on: Page, selector: string) {
  return on.locator(selector).evaluateAll((nodes) => {
    const boxes = nodes.map(node => node.getBoundingClientRect()).filter(box => box.height > 0)
    return Math.max(...boxes.map(box => box.top)) < Math.min(...boxes.map(box => box.bottom))
  })
}

describe('every role in both languages', () => {
  for (const [role, user] of Object.entries(ROLES)) {
    for (const language of ['en', 'es'] as const) {
      it(`${role} in ${language}: the main pages, with no console error`, async () => {
        const errors: string[] = []
        page.on('console', message => message.type() === 'error' && errors.push(`${page.url()}: ${message.text()}`))
        page.on('pageerror', error => errors.push(`${page.url()}: ${error.message}`))
        await page.setViewportSize({ width: 1366, height: 860 })
        await signIn(page, user.email, user.password)
        await page.getByTestId('language-switcher').selectOption(language)
        await page.waitForFunction(code => document.documentElement.lang.startsWith(code), language)
        await open(page, '/')

        const nav = await page
          .getByTestId('main-nav')
          .locator('a')
          .evaluateAll(links => links.map(link => link.getAttribute('href')!))
        expect(nav.length).toBeGreaterThan(1)
        const pages = [...nav, ...await furtherPages(role, page)]
        for (const path of pages) {
          const response = await open(page, path)
          expect(response?.status(), path).toBeLessThan(400)
          expect(await page.locator('html').getAttribute('lang'), path).toMatch(new RegExp(`^${language}`))
          // The header keeps to two rows at 1366 px: the logo with the tools, then the pages.
          expect(await oneLine(page, '[data-testid="header-tools"] > *'), `header tools wrap on ${path}`).toBe(true)
          expect(await oneLine(page, '[data-testid="main-nav"] li'), `navigation wraps on ${path}`).toBe(true)
          expect(await seriousAxeViolations(page), `${role} ${language} ${path}`).toEqual([])
        }
        await screenshot(page, `role-walk-${role}-${language}`)
        expect(errors).toEqual([])
      })
    }
  }

  it('on a phone the header folds the pages into a menu that opens on one press', async () => {
    await page.setViewportSize({ width: 390, height: 800 })
    await signIn(page, OPERATOR.email, OPERATOR.password)
    await open(page, '/')
    const nav = page.getByTestId('main-nav')
    expect(await nav.isVisible()).toBe(false)
    await page.getByRole('button', { name: /^(Menu|Menú)$/ }).click()
    expect(await nav.isVisible()).toBe(true)
    expect(await nav.locator('a').count()).toBeGreaterThan(5)
    await screenshot(page, 'role-walk-phone-menu')
  })
})
