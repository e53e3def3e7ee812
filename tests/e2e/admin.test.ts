import { beforeEach, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { OPERATOR, PLANNER } from '../support/demo-users'
import { open, screenshot, seriousAxeViolations, signIn, type Page } from '../support/browser'
import { useBrowserSuite } from '../support/browser-suite'
import type { RunningServer } from '../support/server'

const suite = useBrowserSuite('admin')
let server: RunningServer
let page: Page
beforeEach(() => ({ server, page } = suite))

describe('recomputations', () => {
  it('the operator starts a recomputation of a scenario and follows it to the end', async () => {
    // Two sites with an SSP2-4.5 outlook, so the recomputation has something to look at.
    const planner = new ApiClient(server.url)
    await planner.signIn(PLANNER.email, PLANNER.password)
    for (const site of ((await planner.get('/api/sites')).body as Array<{ id: string }>).slice(0, 2)) {
      expect(
        (await planner.post(`/api/sites/${site.id}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 4 }))
          .status,
      ).toBe(201)
    }

    await signIn(page, OPERATOR.email, OPERATOR.password)
    await page.getByTestId('main-nav').getByRole('link', { name: 'Recomputations' }).click()
    await expect.poll(() => page.getByRole('heading', { level: 1 }).textContent()).toBe('Recomputations')
    await page.getByLabel('Scenario').selectOption('SSP2-4.5')
    await page.getByTestId('recomputation-start').click()
    await expect.poll(() => page.getByText('Recomputation queued').count()).toBe(1)
    const row = page.getByTestId('recomputation-table').locator('tbody tr').first()
    await expect
      .poll(() => row.getByTestId('recomputation-sites').textContent(), { timeout: 20_000 })
      .toBe('2 of 2 sites')
    await expect.poll(() => row.textContent(), { timeout: 20_000 }).not.toContain('Running')
    expect(await row.textContent()).toContain('An administrator asked for the outlooks for SSP2-4.5 to be recomputed.')
    expect(await seriousAxeViolations(page)).toEqual([])
    await screenshot(page, 'admin-recomputations')
  })

  it('is not in the navigation of anyone else, and refuses them', async () => {
    await signIn(page, PLANNER.email, PLANNER.password)
    expect(await page.getByTestId('main-nav').getByRole('link', { name: 'Recomputations' }).count()).toBe(0)
    await open(page, '/admin/recomputations')
    expect(await page.getByRole('heading', { level: 1 }).textContent()).not.toBe('Recomputations')
  })
})
