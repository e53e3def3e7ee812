import { beforeEach, describe, expect, it } from 'vitest'
import { ANALYST, PLANNER } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'

const suite = useBrowserSuite('form-issues')
let page: Page
beforeEach(() => ({ page } = suite))

/** A new site complete but for the latitude, labelled in the page's language. */
async function fillAllButLatitude(labels: {
  name: RegExp
  longitude: RegExp
  epoch: RegExp
  datum: RegExp
  landEpoch: RegExp
  threshold: RegExp
  height: RegExp
}) {
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
    await fillAllButLatitude({
      name: /^Site name/,
      longitude: /^Longitude/,
      epoch: /^Reference epoch/,
      datum: /^Datum name/,
      landEpoch: /^Epoch/,
      threshold: /^Threshold$/,
      height: /^Height/,
    })
    await page.getByTestId('save-site').click()
    await expect
      .poll(() => beside('site-latitude').textContent())
      .toBe('Latitude (degrees, north positive): Fill this in.')
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
    await expect
      .poll(() => beside('site-latitude').textContent())
      .toBe('Latitude (degrees, north positive): Use 90° or less.')

    await page.getByTestId('language-switcher').selectOption('es')
    await expect
      .poll(() => beside('site-latitude').textContent())
      .toBe('Latitud (grados, positiva al norte): Use un valor de 90° o menos.')
    await page.getByLabel(/^Latitud/).fill('')
    await page.getByRole('button', { name: 'Guardar el sitio' }).click()
    await expect
      .poll(() => beside('site-latitude').textContent())
      .toBe('Latitud (grados, positiva al norte): Rellene este campo.')
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
    await fillAllButLatitude({
      name: /^Site name/,
      longitude: /^Longitude/,
      epoch: /^Reference epoch/,
      datum: /^Datum name/,
      landEpoch: /^Epoch/,
      threshold: /^Threshold$/,
      height: /^Height/,
    })
    await page.getByLabel(/^Latitude/).fill('48')
    await page.getByLabel(/^Height/).fill('40')
    await page.getByTestId('save-site').click()
    await expect
      .poll(() => page.locator('#threshold-height-msg-0').textContent())
      .toBe('Quay edge, Height (m): Use 20 m or less.')
  })
})

/** Switches the page's language (remembered on the account) and waits for it. */
async function speak(language: 'en' | 'es') {
  await page.getByTestId('language-switcher').selectOption(language)
  await page.waitForFunction(code => document.documentElement.lang.startsWith(code), language)
}

describe('the science forms, in the analyst\'s words', () => {
  it('a correlation set names its blank scenario and method beside them, in English and Spanish, until they are typed', async () => {
    await signIn(page, ANALYST.email, ANALYST.password)
    await open(page, '/library/correlation-sets/new')
    await speak('en')
    await page.getByLabel('Title', { exact: true }).fill('Ocean and glaciers together')
    await page.getByLabel('Citation').fill('Illustrative (2026)')
    await page.getByLabel('Licence').fill('CC BY 4.0')
    await page.getByRole('button', { name: 'Save draft' }).click()
    await expect.poll(() => beside('set-scenario').textContent()).toBe('Scenario: Fill this in.')
    expect(await beside('prov-method').textContent()).toBe('Method: Fill this in.')
    expect(await page.getByTestId('set-form-error').textContent()).toBe('2 fields need a change.')
    expect(await page.getByLabel('Scenario').getAttribute('aria-describedby')).toContain('set-scenario-msg')
    expect(await seriousAxeViolations(page), 'refused correlation set').toEqual([])
    await screenshot(page, 'form-issues-correlation-set-en')

    await speak('es')
    await expect.poll(() => beside('set-scenario').textContent()).toBe('Escenario: Rellene este campo.')
    expect(await page.getByTestId('set-form-error').textContent()).toBe('Hay que corregir 2 campos.')
    await page.getByLabel('Escenario').fill('SSP2-4.5')
    await expect.poll(() => beside('set-scenario').textContent()).toBe('')
    expect(await beside('prov-method').textContent()).toBe('Método: Rellene este campo.')
    expect(await page.getByTestId('set-form-error').textContent()).toBe('Hay que corregir un campo.')
    await screenshot(page, 'form-issues-correlation-set-es')
    await speak('en')
  })

  it('a scale-factor grid names its missing component beside the field, and clears it once chosen', async () => {
    await signIn(page, ANALYST.email, ANALYST.password)
    await open(page, '/library/scale-factor-grids/new')
    await speak('en')
    await page.getByLabel('Title', { exact: true }).fill('Glacier fingerprint')
    await page.getByLabel('Method').fill('Illustrative')
    await page.getByLabel('Citation').fill('Illustrative (2026)')
    await page.getByLabel('Licence').fill('CC BY 4.0')
    await page
      .locator('#grid-file')
      .setInputFiles({
        name: 'grid.csv',
        mimeType: 'text/csv',
        buffer: Buffer.from('latitude,-40,-30\n40,1,1.1\n50,1,1\n'),
      })
    await page.getByRole('button', { name: 'Save draft' }).click()
    await expect
      .poll(() => beside('grid-component').textContent())
      .toBe('Component: Choose one of the options offered.')
    await speak('es')
    await expect
      .poll(() => beside('grid-component').textContent())
      .toBe('Componente: Elija una de las opciones que se ofrecen.')
    await screenshot(page, 'form-issues-grid-es')
    await page.getByLabel('Componente').selectOption('glaciers')
    await expect.poll(() => beside('grid-component').textContent()).toBe('')
    expect(await page.getByTestId('grid-form-error').count()).toBe(0)
    await speak('en')

    // A bad cell of the file is named by row and column, and said in the reader's language too.
    await page
      .locator('#grid-file')
      .setInputFiles({ name: 'grid.csv', mimeType: 'text/csv', buffer: Buffer.from('latitude,-40,-30\n40,1,abc\n') })
    await page.getByRole('button', { name: 'Save draft' }).click()
    await expect.poll(() => beside('grid-csv').textContent()).toContain('"abc" is not a finite number.')
    await speak('es')
    await expect.poll(() => beside('grid-csv').textContent()).toContain('«abc» no es un número finito.')
    await speak('en')
  })
})

describe('the briefing form, in the planner\'s words', () => {
  it('names an empty choice of years beside it, in English and Spanish, and clears it once a year is ticked', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    const [site] = (await (await page.request.get('/api/sites')).json()) as { id: string }[]
    const outlook = await page.request.post(`/api/sites/${site!.id}/outlooks`, {
      data: { scenario: 'SSP2-4.5', samples: 20_000 },
    })
    expect(outlook.ok(), await outlook.text()).toBe(true)
    await open(page, `/briefings/new?outlookId=${((await outlook.json()) as { id: string }).id}`)
    await speak('en')
    const years = page.locator('#form-years-msg').locator('..').getByRole('checkbox')
    for (const box of await years.all()) await box.uncheck()
    await page.getByTestId('form-submit').click()
    await expect.poll(() => beside('form-years').textContent()).toBe('Years: Tick at least one.')
    expect(await page.getByTestId('form-error').textContent()).toBe('One field needs a change.')
    expect(await seriousAxeViolations(page), 'refused briefing').toEqual([])
    await speak('es')
    await expect.poll(() => beside('form-years').textContent()).toBe('Años: Marque al menos una opción.')
    await screenshot(page, 'form-issues-briefing-es')
    await years.first().check()
    await expect.poll(() => beside('form-years').textContent()).toBe('')
    expect(await page.getByTestId('form-error').count()).toBe(0)
    await speak('en')
  })
})
