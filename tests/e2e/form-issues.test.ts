import { beforeEach, describe, expect, it } from 'vitest'
import { PLANNER } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

const suite = useBrowserSuite('form-issues')
let page: Page
beforeEach(() => ({ page } = suite))

/** A new site complete but for the latitude, labelled in the page's language. */
async function fillAllButLatitude(labels: { name: RegExp, longitude: RegExp, epoch: RegExp, datum: RegExp, landEpoch: RegExp, threshold: RegExp, height: RegExp }) {
  await page.getByLabel(labels.name).fill('Issue Quay')
  await page.getByLabel(labels.longitude).fill('-33')
  await page.getByLabel(labels.epoch).fill('2020')
  await page.getByLabel(labels.datum).fill('chart datum (illustrative)')
  await page.getByLabel(labels.landEpoch).fill('2020')
  await page.getByLabel(labels.threshold).fill('Quay edge')
  await page.getByLabel(labels.height).fill('0.5')
}

const beside = (field: string) => page.locator(`#${field}-msg`)
const alert = () => page.getByTestId('site-form-error')

describe('a refused site, in the planner\'s words', () => {
  it('names the blank latitude by its label beside the field, and clears it once typed, in English and in Spanish', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    await open(page, '/sites/new')
    await fillAllButLatitude({ name: /^Site name/, longitude: /^Longitude/, epoch: /^Reference epoch/, datum: /^Datum name/, landEpoch: /^Epoch/, threshold: /^Threshold$/, height: /^Height/ })
    await page.getByTestId('save-site').click()
    await expect.poll(() => beside('site-latitude').textContent()).toBe('Latitude (degrees, north positive): Fill this in.')
    expect(await alert().textContent()).toMatch(/^One field needs a change\./)
    expect(await alert().textContent()).not.toMatch(/latitude:/)
    // The field's description points at its message, so a screen reader hears it on the field.
    expect(await page.getByLabel(/^Latitude/).getAttribute('aria-describedby')).toContain('site-latitude-msg')
    expect(await seriousAxeViolations(page), 'refused site form').toEqual([])
    await screenshot(page, 'form-issues-latitude-en')

    await page.getByLabel(/^Latitude/).fill('95')
    await expect.poll(() => beside('site-latitude').textContent()).toBe('')
    expect(await alert().count()).toBe(0)
    await page.getByTestId('save-site').click()
    await expect.poll(() => beside('site-latitude').textContent()).toBe('Latitude (degrees, north positive): Use 90° or less.')

    await page.getByTestId('language-switcher').selectOption('es')
    await expect.poll(() => beside('site-latitude').textContent()).toBe('Latitud (grados, positiva al norte): Use un valor de 90° o menos.')
    await page.getByLabel(/^Latitud/).fill('')
    await page.getByRole('button', { name: 'Guardar el sitio' }).click()
    await expect.poll(() => beside('site-latitude').textContent()).toBe('Latitud (grados, positiva al norte): Rellene este campo.')
    expect(await alert().textContent()).toMatch(/^Hay que corregir un campo\./)
    await screenshot(page, 'form-issues-latitude-es')
    await page.getByLabel(/^Latitud/).fill('48.2')
    await expect.poll(() => beside('site-latitude').textContent()).toBe('')
    expect(await alert().count()).toBe(0)
  })

  it('names a threshold\'s field by the threshold\'s own name', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    await open(page, '/sites/new')
    // The language is remembered on the account, which the test before may have left in Spanish.
    await page.getByTestId('language-switcher').selectOption('en')
    await fillAllButLatitude({ name: /^Site name/, longitude: /^Longitude/, epoch: /^Reference epoch/, datum: /^Datum name/, landEpoch: /^Epoch/, threshold: /^Threshold$/, height: /^Height/ })
    await page.getByLabel(/^Latitude/).fill('48')
    await page.getByLabel(/^Height/).fill('40')
    await page.getByTestId('save-site').click()
    await expect.poll(() => page.locator('#threshold-height-msg-0').textContent()).toBe('Quay edge, Height (m): Use 20 m or less.')
  })
})
