import { beforeEach, describe, expect, it } from 'vitest'
import { ADMIN, ANALYST, OPERATOR, PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { open, seriousAxeViolations, signIn, type BrowserContext, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'
import type { RunningServer } from '../support/server'

const suite = useBrowserSuite('shell')
let server: RunningServer
let context: BrowserContext
let page: Page
beforeEach(() => ({ server, context, page } = suite))

const nav = () => page.getByTestId('main-nav')

describe('the shell for each role', () => {
  // Sites and briefings belong to organisations that plan: their planners and readers see them.
  it.each([
    {
      demo: OPERATOR,
      links: [
        'Overview',
        'Library',
        'Science adopted',
        'Watches',
        'Users',
        'Invitations',
        'Mailbox',
        'Outbox',
        'Recomputations',
        'Audit log',
      ],
    },
    {
      demo: ADMIN,
      links: ['Overview', 'Library', 'Science adopted', 'Watches', 'Users', 'Invitations', 'Outbox', 'Audit log'],
    },
    { demo: ANALYST, links: ['Overview', 'Library', 'Watches'] },
    { demo: PLANNER, links: ['Overview', 'Sites', 'Briefings', 'Library', 'Science adopted', 'Watches'] },
    { demo: READER, links: ['Overview', 'Sites', 'Briefings', 'Library', 'Science adopted', 'Watches'] },
  ])(
    '$demo.role sees the navigation of the role, the demo label and no accessibility faults',
    async ({ demo, links }) => {
      await signIn(page, demo.email, demo.password)
      await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain(demo.name)
      await expect.poll(() => nav().getByRole('link').allTextContents()).toEqual(links)
      expect(await page.getByTestId('illustrative-banner').textContent()).toMatch(/Illustrative demo data/)
      expect(await seriousAxeViolations(page)).toEqual([])
    },
  )

  it('a non-admin who opens an admin page is told their role does not give access', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const response = await open(page, '/admin/users')
    expect(response?.status()).toBe(403)
    expect(await page.textContent('main')).toMatch(/does not give access/)
  })
})

describe('signing in and out', () => {
  it('shows one generic message for a wrong password, and the page passes the accessibility scan', async () => {
    await open(page, '/sign-in')
    expect(await seriousAxeViolations(page)).toEqual([])
    await page.getByLabel('E-mail address').fill(PLANNER.email)
    await page.getByLabel('Password').fill('wrong-password')
    await page.getByRole('button', { name: 'Sign in' }).click()
    await expect.poll(() => page.getByRole('alert').textContent()).toMatch(/do not match an account/)
  })

  it('sends a signed-out visitor to sign in and back to the page they asked for', async () => {
    await open(page, '/admin/audit')
    expect(new URL(page.url()).pathname).toBe('/sign-in')
    await page.getByLabel('E-mail address').fill(ADMIN.email)
    await page.getByLabel('Password').fill(ADMIN.password)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.waitForURL('**/admin/audit')
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Audit log')
    expect(await seriousAxeViolations(page)).toEqual([])
  })

  it('signs out', async () => {
    await signIn(page, READER.email, READER.password)
    await page.getByTestId('sign-out').click()
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Signed out')
    await open(page, '/')
    expect(new URL(page.url()).pathname).toBe('/sign-in')
  })
})

describe('preferences', () => {
  it('switches to Spanish, and the choice follows the account to the next sign-in', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    await page.getByTestId('language-switcher').selectOption('es')
    await expect
      .poll(() => nav().getByRole('link').allTextContents())
      .toEqual(['Resumen', 'Sitios', 'Informes', 'Biblioteca', 'Ciencia adoptada', 'Seguimientos'])
    expect(await page.getAttribute('html', 'lang')).toMatch(/^es/)
    expect(await seriousAxeViolations(page)).toEqual([])

    const second = await context.browser()!.newContext({ baseURL: server.url })
    const elsewhere = await second.newPage()
    await signIn(elsewhere, PLANNER.email, PLANNER.password)
    await expect.poll(() => elsewhere.getByRole('heading', { level: 1 }).textContent()).toContain('Bienvenido/a')
    await Promise.all([
      elsewhere.waitForResponse(
        response => response.url().endsWith('/api/me') && response.request().method() === 'PATCH',
      ),
      elsewhere.getByTestId('language-switcher').selectOption('en'),
    ])
    await second.close()
  })

  it('a planner whose account is in Spanish gets Spanish at sign-in', async () => {
    await signIn(page, PORT_PLANNER.email, PORT_PLANNER.password)
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toContain('Bienvenido/a')
  })

  it('switches heights to feet and keeps the choice across pages', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    await page.getByText('feet', { exact: true }).click()
    await expect.poll(() => page.getByTestId('units-ft').isChecked()).toBe(true)
    await page.reload()
    expect(await page.getByTestId('units-ft').isChecked()).toBe(true)
    const cookies = await context.cookies()
    expect(cookies.find(cookie => cookie.name === 'brinkwater_units')?.value).toBe('ft')
  })
})

describe('administering users in the browser', () => {
  it('an admin adds a user, who then appears in the list, and changes a role', async () => {
    await signIn(page, ADMIN.email, ADMIN.password)
    await nav().getByRole('link', { name: 'Users' }).click()
    await page.waitForURL('**/admin/users')
    expect(await seriousAxeViolations(page)).toEqual([])

    const form = page.getByTestId('create-user-form')
    await form.getByLabel('Name').fill('Rhiannon Vale')
    await form.getByLabel('E-mail').fill('rhiannon@caldwyn.example')
    await form.getByLabel('Organisation').selectOption({ label: 'Caldwyn Coast Regional Council' })
    await form.getByLabel('Role').selectOption('planner')
    await form.getByLabel('First password').fill('short')
    await form.getByRole('button', { name: 'Add user' }).click()
    await expect.poll(() => form.getByRole('alert').textContent()).toMatch(/password: Use at least 12 characters/)

    await form.getByLabel('First password').fill('a-long-first-password')
    await form.getByRole('button', { name: 'Add user' }).click()
    await expect.poll(() => page.getByTestId('admin-notice').textContent()).toMatch(/Rhiannon Vale can now sign in/)
    const row = page.getByTestId('user-row-rhiannon@caldwyn.example')
    await row.getByLabel('Role of Rhiannon Vale').selectOption('reader')
    await expect.poll(() => page.getByTestId('admin-notice').textContent()).toMatch(/Saved changes to Rhiannon Vale/)
    await page.reload()
    expect(
      await page.getByTestId('user-row-rhiannon@caldwyn.example').getByLabel('Role of Rhiannon Vale').inputValue(),
    ).toBe('reader')
  })
})
