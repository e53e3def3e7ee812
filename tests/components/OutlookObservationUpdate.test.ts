import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import OutlookObservationUpdate from '~/components/outlook/OutlookObservationUpdate.vue'
import type { ObservationUpdate, OutlookResult } from '#shared/engine'

// The observation update beside the unweighted outlook, as a reader sees it: numbers in words, not
// that the component rendered. Heights are metres above mean sea level at the epoch; the datum offset
// (0.5 m) is added where a threshold's height is shown.

const estimate = (value: number, extrapolated?: boolean) =>
  ({ value, se: 0.001, ...(extrapolated ? { extrapolated } : {}) })
const percentiles = (low: number, middle: number, high: number) =>
  [[0.17, low], [0.5, middle], [0.83, high]].map(([level, value]) => ({ level: level!, ...estimate(value!) }))

const RESULT = {
  samples: 20_000,
  baselineYear: 2020,
  years: [2020, 2050, 2100],
  byYear: [
    { year: 2020, percentiles: percentiles(0, 0, 0) },
    { year: 2050, percentiles: percentiles(0.1, 0.15, 0.2) },
    { year: 2100, percentiles: percentiles(0.4, 0.6, 0.9) },
  ],
  thresholds: [{
    key: 'quay',
    kind: 'mean-sea-level',
    height: 0.7,
    // By 2100: 35 % unweighted, and a chance beyond the releases' outermost level for the trigger year.
    byYear: [estimate(0), estimate(0.02), estimate(0.35)],
    triggerYears: [{ tolerance: 0.1, year: 2071, extrapolated: true }],
  }],
} as unknown as OutlookResult

// Read to every year here, so the section states 2100; reading only as far ahead as the record spans
// is the last two tests.
const BASE = {
  method: 'likelihood-weighting', observations: 6, firstTime: 2020.5, lastTime: 2025.5,
  residualSd: 0.012, phi: 0.3, ess: 4321.4, minimumEss: 200,
  reach: { mode: 'whole-outlook', fullUntil: 2025.5, noneFrom: null },
} as const

const UPDATED: ObservationUpdate = {
  ...BASE,
  refused: false,
  byYear: [
    { year: 2020, carried: 1, mean: estimate(0), sd: 0, percentiles: percentiles(0, 0, 0) },
    { year: 2050, carried: 1, mean: estimate(0.16), sd: 0.03, percentiles: percentiles(0.13, 0.16, 0.19) },
    { year: 2100, carried: 1, mean: estimate(0.7), sd: 0.1, percentiles: percentiles(0.55, 0.7, 0.85) },
  ],
  thresholds: [{
    key: 'quay',
    height: 0.7,
    byYear: [estimate(0), estimate(0.03), estimate(0.005, true)],
    triggerYears: [{ tolerance: 0.1, year: 2064 }],
  }],
}

const mount = (update: ObservationUpdate) => mountSuspended(OutlookObservationUpdate, {
  props: { result: RESULT, update, labels: { quay: 'Quay Street' }, referenceLevel: 'chart datum', datumOffset: 0.5 },
})

const rowCells = (wrapper: Awaited<ReturnType<typeof mount>>, heading: RegExp) => {
  const row = wrapper.findAll('tbody tr').find(tr => heading.test(tr.find('th').text()))
  expect(row, `a row headed ${heading}`).toBeDefined()
  return row!.findAll('td').map(td => td.text())
}

describe('OutlookObservationUpdate', () => {
  it('shows the updated likely range beside the unweighted one, in 2100', async () => {
    const wrapper = await mount(UPDATED)
    expect(wrapper.find('thead').text()).toContain('In 2100')
    const [unweighted, updated] = rowCells(wrapper, /^Likely range of rise/)
    expect(unweighted).toMatch(/^0\.40 m to 0\.90 m$/)
    expect(updated).toMatch(/^0\.55 m to 0\.85 m$/)
    // The effective sample size is said in words, rounded.
    expect(wrapper.text()).toContain('as if over 4,321 trajectories')
  })

  it('marks an extrapolated chance and trigger year instead of giving them a likelihood word', async () => {
    const wrapper = await mount(UPDATED)
    // The threshold's height is shown above the site's datum: 0.7 m + 0.5 m.
    const [plain, updated] = rowCells(wrapper, /^Chance the mean sea passes Quay Street \(1\.20 m above chart datum\)/)
    expect(plain).not.toContain('extrapolated')
    expect(updated).toMatch(/\(extrapolated: the releases do not describe this tail\)$/)
    const [plainYear, updatedYear] = rowCells(wrapper, /^First year the chance of passing Quay Street/)
    expect([plainYear, updatedYear]).toEqual(['2071 *', '2064 *'])
    expect(wrapper.text()).toContain('* Extrapolated: beyond the outermost level a release publishes.')
  })

  it('states the last year the record reaches, and says how far ahead it is read', async () => {
    // 2020.5–2040.5 reaches 2060.5: 2050 carries a quarter of the record, 2100 none of it.
    const reach = { mode: 'record-length', fullUntil: 2040.5, noneFrom: 2060.5 } as const
    const carried = [1, 0.525, 0]
    const wrapper = await mount({
      ...UPDATED, reach, byYear: UPDATED.byYear.map((year, t) => ({ ...year, carried: carried[t]! })),
    })
    expect(wrapper.find('[data-testid="observation-update-reach"]').text()).toBe(
      'The record is read in full to 2040, less each year after, and not at all from 2061: a record is not read '
      + 'further ahead than it spans. From 2061 on, the updated numbers are the outlook\'s own.',
    )
    expect(wrapper.find('thead').text()).toContain('In 2050')
    const [unweighted, updated] = rowCells(wrapper, /^Likely range of rise/)
    expect([unweighted, updated]).toEqual(['0.10 m to 0.20 m', '0.13 m to 0.19 m'])
  })

  it('shows no numbers when every year after the baseline is out of the record\'s reach', async () => {
    const reach = { mode: 'record-length', fullUntil: 2025.5, noneFrom: 2030.5 } as const
    const carried = [1, 0, 0]
    const wrapper = await mount({
      ...UPDATED, reach, byYear: UPDATED.byYear.map((year, t) => ({ ...year, carried: carried[t]! })),
    })
    expect(wrapper.find('table').exists()).toBe(false)
    expect(wrapper.find('[data-testid="observation-update-out-of-reach"]').text()).toBe(
      'Every year of this outlook after 2020 is beyond the record\'s reach, so the update changes none of its numbers.',
    )
  })

  it('gives no numbers when the update is refused, and says why', async () => {
    const wrapper = await mount({ ...BASE, ess: 37.2, refused: true, reason: 'too-few-effective-samples' })
    const status = wrapper.find('[role="status"]')
    expect(status.text()).toContain('the equivalent of 37 of 20,000 trajectories, fewer than the 200 needed')
    expect(wrapper.find('table').exists()).toBe(false)
    expect(wrapper.text()).not.toContain('0.55 m')
  })
})
