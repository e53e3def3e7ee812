import { mkdir, readFile } from 'node:fs/promises'
import { createRequire } from 'node:module'
import { resolve } from 'node:path'
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core'
import { ROOT } from './server'

const require = createRequire(import.meta.url)
export const SCREENSHOT_DIR = resolve(ROOT, 'tests/e2e/screenshots')

// Flags that keep headless Chromium quiet on a machine without a network beyond loopback.
const FLAGS = ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
  '--disable-background-networking', '--disable-component-update', '--disable-sync']

export function launchBrowser(): Promise<Browser> {
  return chromium.launch({ executablePath: process.env.CHROMIUM_PATH || '/usr/bin/chromium', args: FLAGS })
}

/**
 * A fresh signed-out context whose pages may talk only to the app: any other request is
 * blocked and recorded, so a test can assert that nothing left the machine. Content security
 * policy violations are recorded too.
 */
export async function isolatedContext(browser: Browser, baseURL: string) {
  const context = await browser.newContext({ baseURL, viewport: { width: 1280, height: 860 } })
  const external: string[] = []
  const cspViolations = await watchContentSecurityPolicy(context)
  await context.route('**/*', (route) => {
    const url = route.request().url()
    if (url.startsWith(baseURL) || url.startsWith('data:') || url.startsWith('blob:')) return route.continue()
    external.push(url)
    return route.abort()
  })
  return { context, external, cspViolations }
}

/**
 * Collects every content security policy violation in a context's pages: the page's own
 * securitypolicyviolation events and Chromium's console reports (which also cover workers), so a
 * test can assert that the policy blocked nothing the app needs.
 */
async function watchContentSecurityPolicy(context: BrowserContext) {
  const violations: string[] = []
  await context.addInitScript(() => {
    document.addEventListener('securitypolicyviolation', (event) => {
      console.error(
        `Content Security Policy violation: ${event.effectiveDirective} blocked ${event.blockedURI || 'inline code'} (${event.sourceFile}:${event.lineNumber})`,
      )
    })
  })
  context.on('console', (message) => {
    if (/Content Security Policy/i.test(message.text()))
      violations.push(`${message.page()?.url() ?? 'a worker'}: ${message.text()}`)
  })
  context.on(
    'weberror',
    error => /Content Security Policy/i.test(String(error.error())) && violations.push(String(error.error())),
  )
  return violations
}

/**
 * Makes the context's pages a browser that never goes idle, as Chromium can be with a chart or map
 * animating: `requestIdleCallback` accepts callbacks and never calls them. Installed before any page
 * script runs, so the app's own copy of the function is this one.
 */
export function withholdIdleCallbacks(context: BrowserContext) {
  return context.addInitScript(() => {
    window.requestIdleCallback = () => 0
  })
}

/** Goes to a path and waits until Vue has hydrated it, so clicks reach their handlers. */
export async function open(page: Page, path: string) {
  const response = await page.goto(path)
  await page.waitForSelector('html[data-hydrated="true"]')
  return response
}

export async function signIn(page: Page, email: string, password: string) {
  await open(page, '/sign-in')
  await page.getByLabel(/e-mail|correo/i).fill(email)
  await page.getByLabel(/^password$|^contraseña$/i).fill(password)
  await page.getByRole('button', { name: /sign in|iniciar sesión/i }).click()
  await page.waitForURL(url => !url.pathname.startsWith('/sign-in'))
}

export interface AxeViolation { id: string, impact: string, help: string, nodes: { target: string[] }[] }

let axeSource: string | undefined

/** Serious and critical accessibility violations on the current page, by axe-core. */
export async function seriousAxeViolations(page: Page): Promise<AxeViolation[]> {
  // Evaluated through the DevTools protocol, not added as a <script>: the app's content security
  // policy (rightly) blocks inline scripts without its nonce.
  axeSource ??= await readFile(require.resolve('axe-core/axe.min.js'), 'utf8')
  await page.evaluate(axeSource)
  const violations = await page.evaluate(async () => {
    const result = await (
      window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: AxeViolation[] }> } }
    ).axe.run(document, { resultTypes: ['violations'] })
    return result.violations
  })
  return violations.filter(v => v.impact === 'serious' || v.impact === 'critical')
}

export async function screenshot(page: Page, name: string) {
  await mkdir(SCREENSHOT_DIR, { recursive: true })
  await page.screenshot({ path: resolve(SCREENSHOT_DIR, `${name.replace(/[^\w-]+/g, '-')}.png`), fullPage: true })
}

export type { Browser, BrowserContext, Page }
