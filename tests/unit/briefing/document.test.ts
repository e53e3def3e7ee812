import { describe, expect, it } from 'vitest'
import { buildBriefingDocument, type BriefingSource } from '../../../shared/briefing/document'
import { exceedanceChartOption, fanChartOption } from '../../../shared/briefing/charts'
import { runOutlook } from '../../../shared/engine'

// A real (small) outlook from the engine: one normal source, rise 0.5 ± 0.1 m by 2100.
const result = runOutlook({
  baselineYear: 2020, years: [2020, 2050, 2100], samples: 4000, seed: 5,
  components: [{ key: 'glaciers', scale: 1, release: { form: 'normal', baselineYear: 2020, anchorYears: [2100], mean: [0.5], sd: [0.1] } }],
  heights: { from: 0, to: 1, step: 0.05 },
  thresholds: [{ key: 't1', height: 0.5 }],
  gumbel: { location: 1.5, scale: 0.1 },
})

function source(probability: number, overrides: Partial<BriefingSource> = {}): BriefingSource {
  const patched = structuredClone(result)
  patched.thresholds[0]!.byYear[2] = { value: probability, se: 0 }
  return {
    language: 'en', units: 'm', title: 'Test', audience: '', localContext: '', version: 1, previousVersion: null, issuedAt: null,
    livePath: '/briefings/x', illustrative: false,
    site: { name: 'Testport', referenceLevel: 'MSL 2020', landMotionRate: -2, landMotionSigma: 0.5, landMotionSource: 'gps', landMotionReference: 'Station T', landMotionEpoch: 2020, datumKind: 'mean-sea-level', datumOffset: 0, referenceEpoch: 2020 },
    thresholds: [{ id: 't1', label: 'Quay', height: 0.5, kind: 'mean-sea-level' }],
    years: [2100],
    outlooks: [{ scenario: 'SSP2-4.5', inputHash: 'abc', samples: 4000, seed: 5, correlated: false, result: patched, releaseRefs: [{ component: 'glaciers', version: 3, citation: 'Cite (2026)', state: 'published', scale: 1, scaleSource: null }] }],
    ...overrides,
  }
}

const line = (p: number, overrides: Partial<BriefingSource> = {}) => buildBriefingDocument(source(p, overrides)).summary.lines[0]!.replace(/\u00A0/g, ' ')

describe('briefing summary sentences', () => {
  it('give the chance as odds and a number first, then the calibrated word, at the edges and boundaries', () => {
    // [pub] Mastrandrea et al. (2010) Table 1 for the words; a boundary takes the more cautious word.
    expect(line(0)).toBe('Quay (0.50 m): less than 1 in 100 — less than 1 %, exceptionally unlikely — that the mean sea level here is higher than this by 2100.')
    expect(line(0.01)).toBe('Quay (0.50 m): about a 1-in-100 chance — 1 %, extremely unlikely — that the mean sea level here is higher than this by 2100.')
    expect(line(0.33)).toBe('Quay (0.50 m): about a 1-in-3 chance — 33 %, about as likely as not — that the mean sea level here is higher than this by 2100.')
    expect(line(0.66)).toBe('Quay (0.50 m): about 2 in 3 — 66 %, about as likely as not — that the mean sea level here is higher than this by 2100.')
    expect(line(0.99)).toBe('Quay (0.50 m): about 99 in 100 — 99 %, extremely likely — that the mean sea level here is higher than this by 2100.')
    expect(line(1)).toBe('Quay (0.50 m): near certain — more than 99 %, virtually certain — that the mean sea level here is higher than this by 2100.')
  })

  it('speaks Spanish and feet when issued that way', () => {
    // [practice] 0.5 m = 1.64 ft.
    expect(line(0.25, { language: 'es', units: 'ft' })).toBe('Quay (1,6 ft): aproximadamente 1 entre 4 — 25 %, improbable — de que el nivel medio del mar aquí esté por encima en 2100.')
    const doc = buildBriefingDocument(source(0.25, { language: 'es' }))
    expect(doc.cautions[0]).toMatch(/^Las proyecciones no son predicciones/)
    expect(doc.basis.notes.join(' ')).toMatch(/ningún factor de escala publicado cubre este sitio para Glaciares/)
  })

  it('states the median and likely range, the table, extremes, basis and cautions', () => {
    const doc = buildBriefingDocument(source(0.5))
    // [practice] a normal rise of 0.5 ± 0.1 m: median 0.50 m, likely range 0.40–0.60 m (±0.954 sd), to sampling error.
    expect(doc.summary.ranges[0]).toMatch(/^Between 2020 and 2100 the middle estimate of the rise is 0\.(49|50|51) m; it is likely \(two chances in three\) to lie between 0\.(39|40|41) m and 0\.(59|60|61) m\.$/)
    expect(doc.table.rows).toEqual([{ scenario: 'SSP2-4.5', threshold: 'Quay', height: '0.50 m', measure: 'Mean sea level above it by that year', chances: [{ probability: 0.5, text: '50\u00A0%' }] }])
    expect(doc.basis.datum).toMatch(/^Heights are above MSL 2020 \(mean sea level at an epoch\); mean sea level stood 0\.00 m above it in 2020, the year every rise here is counted from\./)
    expect(doc.extremes!.rows).toHaveLength(1)
    expect(doc.extremes!.today).toBe(100)
    expect(doc.basis.releases[0]).toMatchObject({ component: 'Glaciers', version: 3, citation: 'Cite (2026)' })
    expect(doc.basis.landMotion).toMatch(/^Land motion: -2 mm ± 0.5 mm per year \(negative means the land sinks/)
    expect(doc.cautions.join(' ')).toMatch(/not predictions.*ice sheets.*not engineering or legal advice.*2 m by 2100/)
  })

  it('refuses a year the outlook does not have', () => {
    expect(() => buildBriefingDocument(source(0.5, { years: [2070] }))).toThrow(/Year 2070 is not in the outlook/)
  })

  it('draws the charts in the briefing units', () => {
    const doc = buildBriefingDocument(source(0.5, { units: 'ft', years: [2050, 2100] }))
    const exceedance = exceedanceChartOption(doc) as { series: { data: number[][] }[] }
    expect(exceedance.series).toHaveLength(2)
    // [practice] 1 ft = 0.3048 m: the grid's 0.5 m point sits at 1.64 ft.
    expect(exceedance.series[1]!.data.some(([x]) => Math.abs(x! - 0.5 / 0.3048) < 1e-9)).toBe(true)
    const fan = fanChartOption(doc) as { series: { data: number[] }[] }
    expect(fan.series.at(-1)!.data[0]).toBe(0)
  })
})

describe('briefing tails and storylines', () => {
  it('marks an extrapolated chance with *, gives it no calibrated word, and says what * means', () => {
    const patched = source(0.01)
    patched.outlooks[0]!.result.thresholds[0]!.byYear[2] = { value: 0.01, se: 0.001, extrapolated: true }
    const doc = buildBriefingDocument(patched)
    const summary = doc.summary.lines[0]!.replace(/\u00A0/g, ' ')
    expect(summary).toBe('Quay (0.50 m): about a 1-in-100 chance — 1 %, extrapolated: the releases do not describe this tail — that the mean sea level here is higher than this by 2100.')
    expect(doc.table.rows[0]!.chances[0]).toMatchObject({ text: '1\u00A0% *', extrapolated: true })
    expect(doc.extrapolation).toMatch(/^\* Extrapolated: beyond the outermost level a release publishes\. The release does not describe that tail/)
    // A normal release is never extrapolated, so the unpatched document has no note.
    expect(buildBriefingDocument(source(0.3)).extrapolation).toBeNull()
  })

  it('words amplification as expected floods of today’s 100-year level, with its chance in a year', () => {
    const doc = buildBriefingDocument(source(0.5))
    const g = result.byYear[2]!.gumbel!
    const chance = g.returnPeriods.find(r => r.today === 100)!.annualChance.value
    // [practice] λ = 0.1 m and a rise of 0.5 ± 0.1 m: amplification e^{A/λ} ≈ e^{5.5} ≈ 245, so today's
    // 100-year level is expected more than once a year.
    expect(g.amplification * 0.01005).toBeGreaterThan(1)
    expect(doc.extremes).toEqual({ today: 100, rows: [{ year: 2100, allowance: expect.stringMatching(/^0\.5\d m$/), expected: 'every year or more often', chance: expect.stringMatching(/%$/) }] })
    expect(chance).toBeLessThan(1)
  })

  it('places a storyline beside the chances, one line per chosen year it reaches', () => {
    const doc = buildBriefingDocument(source(0.5, {
      storylines: [{ name: 'Early collapse', description: 'Ice retreats.', version: 2, citation: 'Group (2026)', organisationName: 'Saltglass', illustrative: true, rises: [{ year: 2050, rise: 0.3 }, { year: 2100, rise: 1.4 }] }],
    }))
    expect(doc.storylines).toEqual([{
      name: 'Early collapse (illustrative)', description: 'Ice retreats.',
      lines: [expect.stringMatching(/^If this storyline happened, the mean sea level here would be 1\.40 m above MSL 2020 by 2100 \(a rise of 1\.40 m since 2020\); the outlook puts a 5 % chance on a rise above 0\.6\d m by then\.$/)],
      source: 'Published by Saltglass, version 2: Group (2026)',
    }])
  })
})
