import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER, PORT_PLANNER, READER } from '../support/demo-users'
import { startServer, type RunningServer } from '../support/server'
import { workSettled } from '../support/work'

let server: RunningServer
let planner: ApiClient
let reader: ApiClient
let portPlanner: ApiClient
let siteId: string

/**
 * Annual means 1981–2025 rising `rate` m/yr (6 mm/yr) through 1.20 m in 2020 above the datum, with a small alternating
 * wobble.
 */
function rising(years = 45, from = 1981, skip: number[] = [], rate = 0.006) {
  const rows = Array.from({ length: years }, (_, i) => from + i)
    .filter(year => !skip.includes(year))
    .map(year => `${year},${(1.2 + rate * (year + 0.5 - 2020) + (year % 2 ? 0.004 : -0.004)).toFixed(4)}`)
  return `year,height\n${rows.join('\n')}\n`
}

beforeAll(async () => {
  server = await startServer()
  const as = (user: { email: string, password: string }) => ApiClient.signedIn(server.url, user.email, user.password)
  ;[planner, reader, portPlanner] = await Promise.all([as(PLANNER), as(READER), as(PORT_PLANNER)])
  siteId = (await planner.get('/api/sites')).body.find((s: { name: string }) => s.name === 'Lowmere').id
})

afterAll(async () => {
  await server?.stop()
})

describe('tide-gauge records', () => {
  it('fits an uploaded record, keeps each upload as a version and lists the gaps', async () => {
    const first = await planner.post(`/api/sites/${siteId}/gauge-record`, { csv: rising(45, 1981, [1990, 1991]) })
    expect(first.status).toBe(201)
    expect(first.body.version).toBe(1)
    const second = await planner.post(`/api/sites/${siteId}/gauge-record`, { csv: rising() })
    expect(second.body.version).toBe(2)

    const read = (await reader.get(`/api/sites/${siteId}/gauge-record`)).body
    expect(read.versions.map((v: { version: number, values: number }) => [v.version, v.values])).toEqual([
      [2, 45],
      [1, 43],
    ])
    expect(read.record.gaps).toEqual([])
    // The generating line rises 6 mm/yr with no curve [practice: the test's own model]; the fit recovers it
    // within two of its standard errors.
    const fit = read.record.fit
    expect(Math.abs(fit.rate - 0.006)).toBeLessThan(2 * fit.rateSe + 1e-9)
    expect(Math.abs(fit.acceleration)).toBeLessThan(2 * fit.accelerationSe + 1e-9)
    expect(read.record.fitIssue).toBeNull()
  })

  it('gives uploads sent at the same moment versions one after the other', async () => {
    const before = (await planner.get(`/api/sites/${siteId}/gauge-record`)).body.versions[0].version as number
    const answers = await Promise.all(
      [1, 2, 3].map(() => planner.post(`/api/sites/${siteId}/gauge-record`, { csv: rising() })),
    )
    expect(answers.map(answer => answer.status)).toEqual([201, 201, 201])
    expect(answers.map(answer => answer.body.version as number).sort()).toEqual([before + 1, before + 2, before + 3])
  })

  it('keeps a record too short to fit, saying why there is no fit', async () => {
    const response = await planner.post(`/api/sites/${siteId}/gauge-record`, { csv: rising(12, 2010) })
    expect(response.status).toBe(201)
    const read = (await planner.get(`/api/sites/${siteId}/gauge-record`)).body
    expect(read.record.fit).toBeNull()
    expect(read.record.fitIssue).toMatch(/at least 19 .*nodal cycle/)
    expect(read.tracking).toEqual([])
  })

  it('tracks the fitted rise since the epoch against each scenario\'s latest outlook', async () => {
    const outlook = await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000 })
    expect(outlook.status).toBe(201)
    await planner.post(`/api/sites/${siteId}/gauge-record`, { csv: rising() })
    // The upload computes that outlook again, weighted by the record: tracking reads the newest.
    await workSettled(server.url)
    const [latest] = (await planner.get(`/api/sites/${siteId}/outlooks`)).body as Array<{ id: string }>
    const read = (await planner.get(`/api/sites/${siteId}/gauge-record`)).body
    expect(read.tracking.map((entry: { scenario: string }) => entry.scenario)).toEqual(['SSP2-4.5'])
    for (const entry of read.tracking) {
      expect(entry.outlookId).toBe(latest!.id)
      // 6 mm/yr from 2020 to the middle of 2025 is 33 mm [practice: arithmetic].
      expect(entry.tracking.observed).toBeCloseTo(0.033, 2)
      expect(entry.tracking.epochFrom).toBe('record')
      expect(entry.tracking.likelyLow).toBeLessThan(entry.tracking.likelyHigh)
    }
  })

  // Over the 5.5 years from the 2020 epoch, 40 mm/yr gives 0.22 m and −20 mm/yr gives −0.11 m: far outside
  // any likely range of a few centimetres of rise, with a fit error of a millimetre or two [practice: arithmetic].
  it.each([
    ['above', 0.04],
    ['below', -0.02],
  ])('says the sea is tracking %s the likely range when the record clearly is', async (status, rate) => {
    await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000 })
    await planner.post(`/api/sites/${siteId}/gauge-record`, { csv: rising(45, 1981, [], rate) })
    const [entry] = (await planner.get(`/api/sites/${siteId}/gauge-record`)).body.tracking
    expect(entry.tracking.status).toBe(status)
  })

  it('weighs the site\'s next outlook by the record since the epoch, beside the unweighted numbers', async () => {
    await planner.post(`/api/sites/${siteId}/gauge-record`, { csv: rising(45, 1981, [], 0.004) })
    // A seed of its own: the upload's recomputation of the site's outlook does not compute this one first.
    const posted = await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 41 })
    expect(posted.status).toBe(201)
    const outlook = (await reader.get(`/api/outlooks/${posted.body.id}`)).body
    // Annual means 2020 … 2025 lie at or after the 2020 epoch: six values.
    expect(outlook.input.observations.times).toEqual([2020.5, 2021.5, 2022.5, 2023.5, 2024.5, 2025.5])
    const update = outlook.result.observationUpdate
    expect(update).toMatchObject({ method: 'likelihood-weighting', observations: 6 })
    expect(update.ess).toBeGreaterThan(0)
    if (!update.refused) expect(update.byYear).toHaveLength(outlook.result.byYear.length)
    expect(outlook.result.byYear[0].percentiles).toHaveLength(7)
  })

  it('refuses the update, with no numbers, when the record is far from every trajectory', async () => {
    // 40 mm/yr since 2020 is 0.22 m by 2025, beyond any trajectory of a few centimetres [practice: arithmetic].
    await planner.post(`/api/sites/${siteId}/gauge-record`, { csv: rising(45, 1981, [], 0.04) })
    const posted = await planner.post(`/api/sites/${siteId}/outlooks`, { scenario: 'SSP2-4.5', samples: 20_000, seed: 42 })
    const update = (await planner.get(`/api/outlooks/${posted.body.id}`)).body.result.observationUpdate
    expect(update).toMatchObject({ refused: true, reason: 'too-few-effective-samples' })
    expect(update).not.toHaveProperty('byYear')
  })

  it.each([
    ['a year given twice', 'year,height\n2000,1.1\n2000,1.2\n', /^csv row 3, column year: 2000 is also on row 2/],
    ['millimetres', 'year,height\n2000,1201\n2001,1205\n', /divide by 1000 if millimetres/],
    ['a wrong header', 'date,level\n2000,1.1\n', /^csv header: The header must be "year,height"/],
  ])('refuses a record with %s, saying what to fix, and keeps the stored version', async (_name, csv, message) => {
    // Earlier uploads recompute outlooks in the background; tracking reads the latest, so let them finish.
    await workSettled(server.url)
    const before = (await planner.get(`/api/sites/${siteId}/gauge-record`)).body
    const response = await planner.post(`/api/sites/${siteId}/gauge-record`, { csv })
    expect(response.status).toBe(400)
    expect(response.body.message).toMatch(message)
    expect((await planner.get(`/api/sites/${siteId}/gauge-record`)).body).toEqual(before)
  })

  it('answers another organisation as if the site did not exist, and a reader may not upload', async () => {
    expect((await portPlanner.get(`/api/sites/${siteId}/gauge-record`)).status).toBe(404)
    expect((await portPlanner.post(`/api/sites/${siteId}/gauge-record`, { csv: rising() })).status).toBe(404)
    expect((await reader.post(`/api/sites/${siteId}/gauge-record`, { csv: rising() })).status).toBe(403)
  })
})
