import { resolve } from 'node:path'
import { afterAll, afterEach, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { OPERATOR, PLANNER, READER } from '../support/demo-users'
import {
  isolatedContext,
  open,
  launchBrowser,
  screenshot,
  SCREENSHOT_DIR,
  seriousAxeViolations,
  signIn,
  type Browser,
  type BrowserContext,
  type Page,
} from '../support/browser'
import { awaitMail, linkIn } from '../support/mailbox'
import { startServer, type RunningServer } from '../support/server'

let server: RunningServer
let browser: Browser
// Each test may act as several people at once (a planner, the admin, a visitor from an e-mail):
// every one gets a fresh isolated context, all with external requests blocked.
let people: { name: string, context: BrowserContext, external: string[], cspViolations: string[], page: Page }[]

beforeAll(async () => {
  server = await startServer()
  browser = await launchBrowser()
})
afterAll(async () => {
  await browser?.close()
  await server?.stop()
})
beforeEach(() => { people = [] })
// Screenshots are kept for every failure (and for every test with BRINKWATER_SCREENSHOTS=all).
afterEach(async (ctx) => {
  for (const person of people) {
    if (ctx.task.result?.state === 'fail' || process.env.BRINKWATER_SCREENSHOTS === 'all')
      await screenshot(person.page, `mail-${ctx.task.name}-${person.name}`)
    await person.context.close()
  }
  for (const person of people) expect(person.external, `requests that left the app (${person.name})`).toEqual([])
  for (const person of people)
    expect(person.cspViolations, `content security policy violations (${person.name})`).toEqual([])
})

async function person(name: string) {
  const { context, external, cspViolations } = await isolatedContext(browser, server.url)
  const page = await context.newPage()
  people.push({ name, context, external, cspViolations, page })
  return page
}
const snap = (page: Page, name: string) =>
  process.env.BRINKWATER_SCREENSHOTS === 'all' ? screenshot(page, `mail-step-${name}`) : undefined
const noAxeFaults = async (page: Page, where: string) => expect(await seriousAxeViolations(page), where).toEqual([])
const heading = (page: Page) => page.getByRole('heading', { level: 1 }).textContent()

async function admin() {
  // The operator: the stand-in mailbox holds everyone's links, so it is theirs alone.
  const page = await person('admin')
  await signIn(page, OPERATOR.email, OPERATOR.password)
  return page
}

describe('watching a site by e-mail', () => {
  it('a planner asks to watch Kelwick, the admin reads the confirmation, a click confirms it and the stop link ends it', async () => {
    const planner = await person('planner')
    await signIn(planner, PLANNER.email, PLANNER.password)
    const sites: { id: string, name: string }[] = await (await planner.request.get('/api/sites')).json()
    const kelwick = sites.find(site => site.name === 'Kelwick')!
    await open(planner, `/watches/site/${kelwick.id}`)
    expect(await heading(planner)).toBe('Watch Kelwick')
    await noAxeFaults(planner, 'watch a site')
    const form = planner.getByTestId('watch-form')
    expect(await form.getByLabel('E-mail address').inputValue()).toBe(PLANNER.email)
    await form.getByLabel('Language of the e-mails').selectOption('en')
    await form.getByRole('button', { name: 'Watch this site' }).click()
    await expect.poll(() => planner.getByTestId('watch-sent').textContent()).toMatch(/Check your inbox/)
    await snap(planner, 'watch-requested')

    await planner.getByTestId('main-nav').getByRole('link', { name: 'Watches' }).click()
    await planner.waitForURL('**/watches')
    await expect.poll(() => planner.getByTestId('watch-row-Kelwick').textContent()).toMatch(/Waiting for confirmation/)
    await noAxeFaults(planner, 'your watches, pending')

    // The admin reads the confirmation in the stand-in mailbox: text, sandboxed HTML and headers.
    const desk = await admin()
    await awaitMail(desk, PLANNER.email, /watch Kelwick/)
    await desk.getByTestId('main-nav').getByRole('link', { name: 'Mailbox' }).click()
    await desk.waitForURL('**/admin/mailbox')
    await desk
      .getByTestId('mailbox-list')
      .getByRole('button', { name: /Confirm that you want to watch Kelwick/ })
      .click()
    const reader = desk.getByTestId('mailbox-reader')
    await expect
      .poll(() => reader.getByRole('heading', { level: 2 }).textContent())
      .toBe('Confirm that you want to watch Kelwick')
    expect(await reader.getByTestId('mail-to').textContent()).toBe(PLANNER.email)
    const text = (await reader.getByTestId('mail-text').textContent())!
    const frame = reader.getByTestId('mail-html')
    expect(await frame.getAttribute('sandbox')).toBe('')
    expect(
      await desk.frameLocator('[data-testid="mail-html"]').getByRole('link', { name: 'Confirm the watch' }).count(),
    ).toBe(1)
    const headers = (await reader.getByTestId('mail-headers').textContent())!
    expect(headers).toMatch(/list-unsubscribe.*\/api\/watches\/unsubscribe\?token=/)
    expect(headers).toMatch(/List-Unsubscribe=One-Click/)
    await noAxeFaults(desk, 'mailbox')
    await snap(desk, 'mailbox')
    // Headless Chromium leaves a sandboxed (out-of-process) frame blank in full-page shots: keep its own.
    if (process.env.BRINKWATER_SCREENSHOTS === 'all')
      await frame.screenshot({ path: resolve(SCREENSHOT_DIR, 'mail-step-mailbox-html.png') })

    await desk.getByTestId('main-nav').getByRole('link', { name: 'Outbox' }).click()
    await desk.waitForURL('**/admin/outbox')
    expect(await desk.getByTestId('outbox-transport').textContent()).toMatch(/local stand-in/)
    expect(
      await desk
        .getByTestId('outbox-table')
        .getByRole('row', { name: /watch Kelwick/ })
        .textContent(),
    ).toMatch(/Sent/)
    await noAxeFaults(desk, 'outbox')
    await snap(desk, 'outbox')

    // Someone opens the link from the e-mail, without an account: nothing happens until they press.
    const visitor = await person('visitor')
    const confirmPath = linkIn(text, '/watches/confirm?token=')
    await open(visitor, confirmPath)
    expect(await heading(visitor)).toBe('Confirm your watch')
    expect(await visitor.getByTestId('watch-link-about').textContent()).toBe(
      `You asked for e-mails about Kelwick at ${PLANNER.email}.`,
    )
    await noAxeFaults(visitor, 'confirm a watch')
    await visitor.getByRole('button', { name: 'Confirm the watch' }).click()
    await expect.poll(() => heading(visitor)).toBe('You are watching Kelwick')
    expect(await visitor.getByRole('status').textContent()).toContain(PLANNER.email)
    await snap(visitor, 'confirmed')
    // The link works once: a fresh load says so at once, with nothing to press.
    await open(visitor, confirmPath)
    await expect.poll(() => visitor.getByRole('alert').textContent()).toMatch(/already been used/)
    expect(await visitor.getByRole('button', { name: 'Confirm the watch' }).count()).toBe(0)

    await planner.reload()
    await expect.poll(() => planner.getByTestId('watch-row-Kelwick').textContent()).toMatch(/Active/)
    await noAxeFaults(planner, 'your watches, active')

    // The stop link, read in Spanish this time.
    await open(visitor, linkIn(text, '/watches/unsubscribe?token='))
    await visitor.getByTestId('language-switcher').selectOption('es')
    await expect.poll(() => heading(visitor)).toBe('Detener un seguimiento')
    expect(await visitor.getByTestId('watch-link-about').textContent()).toBe(
      `Los correos sobre Kelwick llegan a ${PLANNER.email}.`,
    )
    await noAxeFaults(visitor, 'unsubscribe (es)')
    await visitor.getByRole('button', { name: 'Dejar de recibir estos correos' }).click()
    await expect.poll(() => heading(visitor)).toBe('Seguimiento detenido')
    await snap(visitor, 'unsubscribed')
    // Opened again, the stop link says the watch is already stopped, with nothing to press.
    await open(visitor, linkIn(text, '/watches/unsubscribe?token='))
    await expect
      .poll(() => visitor.getByTestId('watch-link-about').textContent())
      .toBe(`Este seguimiento ya está detenido: ${PLANNER.email} no recibe correos sobre Kelwick.`)
    expect(await visitor.getByRole('button', { name: 'Dejar de recibir estos correos' }).count()).toBe(0)

    await planner.reload()
    await expect.poll(() => planner.getByTestId('watch-empty').isVisible()).toBe(true)
  })

  it('a watch still waiting for confirmation can be stopped from the watches page', async () => {
    const planner = await person('planner')
    await signIn(planner, PLANNER.email, PLANNER.password)
    const sites: { id: string, name: string }[] = await (await planner.request.get('/api/sites')).json()
    const site = sites.find(candidate => candidate.name !== 'Kelwick')!
    await open(planner, `/watches/site/${site.id}`)
    await planner.getByRole('button', { name: 'Watch this site' }).click()
    await expect.poll(() => planner.getByTestId('watch-sent').isVisible()).toBe(true)
    await open(planner, '/watches')
    await planner
      .getByTestId(`watch-row-${site.name}`)
      .getByRole('button', { name: `Stop watching ${site.name}` })
      .click()
    await expect
      .poll(() => planner.getByTestId('watch-notice').textContent())
      .toBe(`You will get no more e-mail about ${site.name}.`)
    await expect.poll(() => planner.getByTestId(`watch-row-${site.name}`).count()).toBe(0)
  })
})

describe('accounts by e-mail', () => {
  it('the admin invites a new planner, whose link sets a password and signs them in', async () => {
    const desk = await admin()
    await desk.getByTestId('main-nav').getByRole('link', { name: 'Invitations' }).click()
    await desk.waitForURL('**/admin/invitations')
    await noAxeFaults(desk, 'invitations')
    const form = desk.getByTestId('invite-form')
    await form.getByLabel('Name').fill('Carys Penhallow')
    await form.getByLabel('E-mail').fill('carys@caldwyn.example')
    await form.getByLabel('Organisation').selectOption({ label: 'Caldwyn Coast Regional Council' })
    await form.getByLabel('Role').selectOption('planner')
    await form.getByRole('button', { name: 'Send the invitation' }).click()
    await expect
      .poll(() => desk.getByTestId('invite-notice').textContent())
      .toMatch(/Invitation to carys@caldwyn.example is queued/)
    await snap(desk, 'invited')
    const mail = await awaitMail(desk, 'carys@caldwyn.example', /invites you to Brinkwater/)
    const invitationPath = linkIn(mail.text, '/account/invitation?token=')

    const newcomer = await person('newcomer')
    await open(newcomer, invitationPath)
    expect(await newcomer.getByTestId('invitation-offer').textContent()).toMatch(
      /Carys Penhallow, you are invited to join Caldwyn Coast Regional Council as Planner/,
    )
    await noAxeFaults(newcomer, 'invitation')
    await newcomer.getByLabel('New password', { exact: true }).fill('too-short')
    await newcomer.getByLabel('Type the new password again').fill('too-short')
    await newcomer.getByRole('button', { name: 'Create my account' }).click()
    await expect.poll(() => newcomer.getByRole('alert').textContent()).toMatch(/at least 12 characters/)
    await newcomer.getByLabel('New password', { exact: true }).fill('kelp rope harbour lantern')
    await newcomer.getByLabel('Type the new password again').fill('kelp rope harbour lantern')
    await snap(newcomer, 'invitation')
    await newcomer.getByRole('button', { name: 'Create my account' }).click()
    await newcomer.waitForURL(url => url.pathname === '/')
    await expect.poll(() => heading(newcomer)).toContain('Carys Penhallow')

    // The link is spent: a second visit says so and where to turn.
    await open(newcomer, invitationPath)
    await expect
      .poll(() => newcomer.getByTestId('link-problem').textContent())
      .toMatch(/already been used.*administrator/)
  })

  it('a reader who forgot their password chooses a new one from the e-mailed link and signs in with it', async () => {
    const visitor = await person('reader')
    await open(visitor, '/sign-in')
    await snap(visitor, 'sign-in')
    await visitor.getByRole('link', { name: 'Forgot your password?' }).click()
    await visitor.waitForURL('**/account/forgot')
    await noAxeFaults(visitor, 'forgot password')
    await visitor.getByLabel('E-mail address').fill(READER.email)
    await visitor.getByRole('button', { name: 'Send the link' }).click()
    await expect.poll(() => visitor.getByTestId('forgot-sent').textContent()).toMatch(/Check your inbox/)
    await snap(visitor, 'forgot-sent')

    const desk = await admin()
    const mail = await awaitMail(desk, READER.email, /Reset your Brinkwater password/)
    await open(visitor, linkIn(mail.text, '/account/reset?token='))
    await noAxeFaults(visitor, 'reset password')
    await visitor.getByLabel('New password', { exact: true }).fill('tidewater marsh lantern')
    await visitor.getByLabel('Type the new password again').fill('tidewater marsh lanterns')
    await visitor.getByRole('button', { name: 'Save the new password' }).click()
    await expect.poll(() => visitor.getByRole('alert').textContent()).toMatch(/not the same/)
    await visitor.getByLabel('Type the new password again').fill('tidewater marsh lantern')
    await visitor.getByRole('button', { name: 'Save the new password' }).click()
    await expect.poll(() => heading(visitor)).toBe('Password changed')
    await snap(visitor, 'reset-done')

    await signIn(visitor, READER.email, 'tidewater marsh lantern')
    await expect.poll(() => heading(visitor)).toContain(READER.name)
  })
})
