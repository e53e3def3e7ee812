import { afterAll, afterEach, beforeAll, beforeEach, expect } from 'vitest'
import { isolatedContext, launchBrowser, screenshot, type Browser, type BrowserContext, type Page } from './browser'
import { startServer, type RunningServer } from './server'

export interface BrowserSuite {
  server: RunningServer
  browser: Browser
  context: BrowserContext
  page: Page
  external: string[]
  /** Content security policy violations in this test's context so far. */
  cspViolations: string[]
  /** Closes this test's context (checking its requests) and opens a fresh signed-out one. */
  freshContext: () => Promise<Page>
}

/**
 * The set-up every browser test file shares: one built server and one Chromium for the file, a
 * fresh isolated context per test, a screenshot on failure (every test with
 * BRINKWATER_SCREENSHOTS=all), and a failure if any request tried to leave the app or the
 * content security policy blocked anything.
 */
export function useBrowserSuite(name: string): BrowserSuite {
  const suite = {} as BrowserSuite
  suite.freshContext = async () => {
    await suite.context.close()
    expect(suite.external, 'requests that left the app').toEqual([])
    expect(suite.cspViolations, 'content security policy violations').toEqual([])
    const fresh = await isolatedContext(suite.browser, suite.server.url)
    ;({ context: suite.context, external: suite.external, cspViolations: suite.cspViolations } = fresh)
    suite.page = await suite.context.newPage()
    return suite.page
  }
  beforeAll(async () => {
    suite.server = await startServer()
    suite.browser = await launchBrowser()
  })
  afterAll(async () => {
    await suite.browser?.close()
    await suite.server?.stop()
  })
  beforeEach(async () => {
    ;({
      context: suite.context,
      external: suite.external,
      cspViolations: suite.cspViolations,
    } = await isolatedContext(suite.browser, suite.server.url))
    suite.page = await suite.context.newPage()
  })
  afterEach(async (ctx) => {
    if (ctx.task.result?.state === 'fail' || process.env.BRINKWATER_SCREENSHOTS === 'all')
      await screenshot(suite.page, `${name}-${ctx.task.name}`)
    await suite.context.close()
    expect(suite.external, 'requests that left the app').toEqual([])
    expect(suite.cspViolations, 'content security policy violations').toEqual([])
  })
  return suite
}
