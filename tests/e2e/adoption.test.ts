import { beforeEach, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { ANALYST, PLANNER, READER, demoUser } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'
import type { RunningServer } from '../support/server'

// The adoption page: a planner sees the series their outlooks use, another group's series offered
// beside them, and adopts it; a reader sees the same without the form; the outlook page lists it.

const suite = useBrowserSuite('adoption')
const REVIEWER = demoUser('reviewer@saltglass.example')
let server: RunningServer
let page: Page
beforeEach(() => ({ server, page } = suite))

async function publishStoryline() {
  const analyst = await ApiClient.signedIn(server.url, ANALYST.email, ANALYST.password)
  const reviewer = await ApiClient.signedIn(server.url, REVIEWER.email, REVIEWER.password)
  const draft = await analyst.post('/api/releases', {
    series: { component: 'glaciers', scenario: 'SSP2-4.5', title: 'High-end glacier storyline (illustrative)' },
    form: 'normal',
    baselineYear: 2020,
    anchorYears: [2050, 2100, 2150],
    mean: [0.09, 0.2, 0.3],
    sd: [0.02, 0.05, 0.07],
    method: 'Browser test.',
    citation: 'Browser test (2026).',
    licence: 'CC BY 4.0',
  })
  expect((await analyst.post(`/api/releases/${draft.body.id}/submit`)).status).toBe(200)
  expect((await reviewer.post(`/api/releases/${draft.body.id}/approve`)).status).toBe(200)
  return draft.body.seriesId as string
}

describe('the science an organisation adopted', () => {
  it('offers another series on the outlook and the adoption page, and a planner adopts it', async () => {
    const planner = await ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)
    const kelwick = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Kelwick').id
    const outlook = await planner.post(`/api/sites/${kelwick}/outlooks`, {
      scenario: 'SSP2-4.5',
      samples: 4000,
      seed: 2,
    })
    const storyline = await publishStoryline()

    await signIn(page, PLANNER.email, PLANNER.password)
    await open(page, `/sites/${kelwick}/outlooks/${outlook.body.id}`)
    await expect
      .poll(() => page.getByTestId('offered-science').textContent())
      .toContain('High-end glacier storyline (illustrative)')

    await page.getByTestId('main-nav').getByRole('link', { name: 'Science adopted' }).click()
    await expect
      .poll(() => page.getByRole('heading', { level: 1 }).textContent())
      .toBe('Science your organisation adopted')
    const glaciers = page.getByTestId('adopt-glaciers')
    expect(await glaciers.getByTestId('offered-series').textContent()).toContain('Available, not adopted')
    expect(await seriousAxeViolations(page)).toEqual([])
    await screenshot(page, 'adoption-page')
    await glaciers.getByLabel(/High-end glacier storyline/).check()
    await page.getByTestId('adoption-save').click()
    await expect.poll(() => page.getByTestId('adoption-saved').count()).toBe(1)
    const view = (
      await planner.get(`/api/organisations/${(await planner.get('/api/me')).body.user.organisationId}/adoption`)
    ).body
    const adopted = view.scenarios
      .find((s: { scenario: string }) => s.scenario === 'SSP2-4.5')
      .components.find((c: { component: string }) => c.component === 'glaciers').adopted
    expect(adopted).toMatchObject({ seriesId: storyline, automatic: false, adoptedBy: 'Noor Halloran' })
  })

  it('shows a reader what is adopted, in Spanish too, without a form to change it', async () => {
    await signIn(page, READER.email, READER.password)
    await open(page, '/adoption')
    expect(await page.getByTestId('adoption-save').count()).toBe(0)
    expect(
      await page.getByText('A planner or an administrator of your organisation can change what it adopts.').count(),
    ).toBe(1)
    await page.getByTestId('language-switcher').selectOption('es')
    await expect
      .poll(() => page.getByRole('heading', { level: 1 }).textContent())
      .toBe('Ciencia que adoptó su organización')
    expect(await seriousAxeViolations(page)).toEqual([])
  })
})
