import { describe, expect, it } from 'vitest'
import { buildBriefingDocument, type BriefingSource } from '../../../shared/briefing/document'
import { exceedanceChartOption, fanChartOption } from '../../../shared/briefing/charts'
import { runOutlook } from '../../../shared/engine'
import { testportSource } from '../../support/briefing-source'

// A real (small) outlook from the engine: one normal source, rise 0.5 ± 0.1 m by 2100.
const result = runOutlook({
  baselineYear: 2020,
  years: [2020, 2050, 2100],
  samples: 4000,
  seed: 5,
  components: [
    {
      key: 'glaciers',
      scale: 1,
      release: { form: 'normal', baselineYear: 2020, anchorYears: [2100], mean: [0.5], sd: [0.1] },
    },
  ],
  heights: { from: 0, to: 1, step: 0.05 },
  thresholds: [{ key: 't1', height: 0.5 }],
  gumbel: { location: 1.5, scale: 0.1 },
})

function source(probability: number, overrides: Partial<BriefingSource> = {}): BriefingSource {
  const patched = structuredClone(result)
  patched.thresholds[0]!.byYear[2] = { value: probability, se: 0 }
  return testportSource(patched, 4000, overrides)
}

const detail = (p: number, overrides: Partial<BriefingSource> = {}) =>
  buildBriefingDocument(source(p, overrides)).detail!.lines[0]!.replace(/\u00A0/g, ' ')
const findings = (doc: ReturnType<typeof buildBriefingDocument>) =>
  doc.summary.findings!.map(f => f.replace(/\u00A0/g, ' '))

describe('briefing sentences', () => {
  it('say each chance once, one way: the number, then the calibrated word, at the edges and boundaries', () => {
    // [pub] Mastrandrea et al. (2010) Table 1 for the words; a boundary takes the more cautious word.
    expect(detail(0)).toBe(
      '“Quay” (0.50 m): the chance that the mean sea level here is above it is less than 1 % (exceptionally unlikely) by 2100.',
    )
    expect(detail(0.01)).toBe(
      '“Quay” (0.50 m): the chance that the mean sea level here is above it is 1 % (extremely unlikely) by 2100.',
    )
    expect(detail(0.33)).toBe(
      '“Quay” (0.50 m): the chance that the mean sea level here is above it is 33 % (about as likely as not) by 2100.',
    )
    expect(detail(0.66)).toBe(
      '“Quay” (0.50 m): the chance that the mean sea level here is above it is 66 % (about as likely as not) by 2100.',
    )
    expect(detail(0.99)).toBe(
      '“Quay” (0.50 m): the chance that the mean sea level here is above it is 99 % (extremely likely) by 2100.',
    )
    expect(detail(1)).toBe(
      '“Quay” (0.50 m): the chance that the mean sea level here is above it is more than 99 % (virtually certain) by 2100.',
    )
    // Never the odds beside the number and the word: one way of saying it.
    expect(detail(0)).not.toMatch(/in 100/)
  })

  it('give an extrapolated chance no calibrated word', () => {
    const patched = source(0.004)
    patched.outlooks[0]!.result.thresholds[0]!.byYear[2] = { value: 0.004, se: 0, extrapolated: true }
    const doc = buildBriefingDocument(patched)
    expect(doc.detail!.lines[0]).toMatch(
      /less than 1\u00A0% \(extrapolated: the releases do not describe this tail\) by 2100/,
    )
    expect(doc.summary.findings![0]).toMatch(/extrapolated: the releases do not describe this tail/)
    expect(doc.summary.findings!.join(' ')).not.toMatch(/unlikely/)
  })

  it('speaks Spanish and feet when issued that way', () => {
    // [practice] 0.5 m = 1.64 ft.
    expect(detail(0.25, { language: 'es', units: 'ft' })).toBe(
      '«Quay» (1,6 ft): la probabilidad de que el nivel medio del mar aquí lo supere es del 25 % (improbable) para 2100.',
    )
    expect(detail(0.004, { language: 'es', years: [2050, 2100] })).toMatch(
      /lo supere es de menos del 1 % \(excepcionalmente improbable\) para 2050 y de menos del 1 % \(excepcionalmente improbable\) para 2100\.$/,
    )
    const doc = buildBriefingDocument(source(0.25, { language: 'es' }))
    expect(doc.cautions[0]).toMatch(/^Las proyecciones no son predicciones/)
    expect(doc.basis.notes.join(' ')).toMatch(/ningún factor de escala publicado cubre este sitio para Glaciares/)
    expect(doc.meta.heights).toBe('Alturas en metros sobre MSL 2020.')
  })
})

describe('the findings a councillor reads first', () => {
  const compared = (lowChance: number, highChance: number, overrides: Partial<BriefingSource> = {}) => {
    const base = source(lowChance, overrides)
    const high = structuredClone(base.outlooks[0]!)
    high.scenario = 'SSP5-8.5'
    high.result.thresholds[0]!.byYear[2] = { value: highChance, se: 0 }
    return buildBriefingDocument({ ...base, outlooks: [...base.outlooks, high] })
  }

  it('lead with the key threshold, its trigger year and the spread over scenarios, one sentence each', () => {
    const doc = compared(0.23, 0.64)
    const [key, trigger, spread] = findings(doc)
    expect(findings(doc)).toHaveLength(3)
    expect(key).toBe(
      'Under SSP2-4.5, the chance that the mean sea level at Testport rises above “Quay” (0.50 m) is 23 % (unlikely) by 2100.',
    )
    // With several years, the first and the last chosen: how the chance grows.
    const two = findings(compared(0.23, 0.64, { years: [2050, 2100] }))[0]!
    expect(two).toMatch(
      /^Under SSP2-4\.5, .+ \(0\.50 m\) is (\d+|less than 1) % \([a-z ]+\) by 2050 and 23 % \(unlikely\) by 2100\.$/,
    )
    // The engine's own 10 % trigger year of this outlook (the rise passes 0.5 m with 10 % chance before 2100).
    const year = result.thresholds[0]!.triggerYears.find(t => t.tolerance === 0.1)!.year
    expect(trigger).toBe(
      year === null
        ? 'The chance of passing “Quay” stays below 10 %, the chance this briefing plans to, up to 2100, the last year computed.'
        : `The chance of passing “Quay” reaches 10 %, the chance this briefing plans to, in ${year}: its trigger year.`,
    )
    expect(spread).toBe(
      'Across the 2 scenarios compared, that chance by 2100 runs from 23 % (unlikely) under SSP2-4.5 to 64 % (about as likely as not) under SSP5-8.5.',
    )
  })

  it('say the spread in Spanish with the right article at the edges', () => {
    const doc = compared(0.004, 0.64, { language: 'es' })
    expect(findings(doc)[2]).toBe(
      'En los 2 escenarios comparados, esa probabilidad para 2100 va de menos del 1 % (excepcionalmente improbable) con SSP2-4.5 al 64 % (tan probable como improbable) con SSP5-8.5.',
    )
  })

  it('give the likely range in place of the spread when one scenario is shown', () => {
    const doc = buildBriefingDocument(source(0.5))
    expect(doc.summary.findings).toHaveLength(3)
    expect(doc.summary.findings![2]).toMatch(/^Between 2020 and 2100 the middle estimate of the rise is/)
  })

  it('follow with a compact table of thresholds × years under the briefing\'s scenario only', () => {
    const doc = compared(0.23, 0.64, { years: [2050, 2100] })
    expect(doc.summary.grid).toMatchObject({ scenario: 'SSP2-4.5', years: [2050, 2100] })
    expect(doc.summary.grid!.rows).toHaveLength(1)
    expect(doc.summary.grid!.rows[0]!.chances[1]).toEqual({ probability: 0.23, text: '23\u00A0%' })
    expect(doc.table.rows).toHaveLength(2)
    expect(doc.summary.lines).toBeUndefined()
  })

  it('name the issuing organisation, the author and the heights\' datum', () => {
    const doc = buildBriefingDocument(source(0.5))
    expect(doc.meta).toMatchObject({
      organisation: 'Testport Council',
      author: 'Ada Planner',
      heights: 'Heights in metres above MSL 2020.',
    })
  })

  it('state how the sources were tied together, never "published correlations" beside "independent"', () => {
    const independent = buildBriefingDocument(source(0.5))
    const all = [...independent.basis.notes, ...independent.basis.method].join(' ')
    expect(all).toMatch(/sampled as independent/)
    expect(all).not.toMatch(/published correlations/)
    const tied = buildBriefingDocument(source(0.5, { outlooks: [{ ...source(0.5).outlooks[0]!, correlated: true }] }))
    expect(tied.basis.notes.join(' ')).toMatch(
      /SSP2-4.5: the sources were sampled with the correlations published for this scenario\./,
    )
    expect(tied.basis.notes.join(' ')).not.toMatch(/independent/)
  })
})

describe('briefing document', () => {
  it('states the median and likely range, the table, extremes, basis and cautions', () => {
    const doc = buildBriefingDocument(source(0.5))
    // [practice] a normal rise of 0.5 ± 0.1 m: median 0.50 m, likely range 0.40–0.60 m (±0.954 sd), to sampling error.
    expect(doc.detail!.ranges[0]).toMatch(
      /^Between 2020 and 2100 the middle estimate of the rise is 0\.(49|50|51) m; it is likely \(two chances in three\) to lie between 0\.(39|40|41) m and 0\.(59|60|61) m\.$/,
    )
    expect(doc.table.rows).toEqual([
      {
        scenario: 'SSP2-4.5',
        threshold: 'Quay',
        height: '0.50 m',
        measure: 'Mean sea level above it by that year',
        chances: [{ probability: 0.5, text: '50\u00A0%' }],
      },
    ])
    expect(doc.basis.datum).toMatch(
      /^Heights are above MSL 2020 \(mean sea level at an epoch\); mean sea level stood 0\.00 m above it in 2020, the year every rise here is counted from\./,
    )
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
    const fan = fanChartOption(doc) as { series: { data: number[][] }[] }
    expect(fan.series.at(-1)!.data[0]).toEqual([2020, 0])
  })
})

describe('briefing tails and storylines', () => {
  it('marks an extrapolated chance with *, gives it no calibrated word, and says what * means', () => {
    const patched = source(0.01)
    patched.outlooks[0]!.result.thresholds[0]!.byYear[2] = { value: 0.01, se: 0.001, extrapolated: true }
    const doc = buildBriefingDocument(patched)
    const detail = doc.detail!.lines[0]!.replace(/\u00A0/g, ' ')
    expect(detail).toContain('1 % (extrapolated: the releases do not describe this tail)')
    expect(detail).not.toMatch(/exceptionally unlikely|very unlikely|unlikely/)
    expect(doc.table.rows[0]!.chances[0]).toMatchObject({ text: '1\u00A0% *', extrapolated: true })
    expect(doc.extrapolation).toMatch(
      /^\* Extrapolated: beyond the outermost level a release publishes\. The release does not describe that tail/,
    )
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
    expect(doc.extremes).toEqual({
      today: 100,
      rows: [
        {
          year: 2100,
          allowance: expect.stringMatching(/^0\.5\d m$/),
          expected: 'every year or more often',
          chance: expect.stringMatching(/%$/),
        },
      ],
    })
    expect(chance).toBeLessThan(1)
  })

  it('places a storyline beside the chances, one line per chosen year it reaches', () => {
    const doc = buildBriefingDocument(
      source(0.5, {
        storylines: [
          {
            name: 'Early collapse',
            description: 'Ice retreats.',
            version: 2,
            citation: 'Group (2026)',
            organisationName: 'Saltglass',
            illustrative: true,
            rises: [
              { year: 2050, rise: 0.3 },
              { year: 2100, rise: 1.4 },
            ],
          },
        ],
      }),
    )
    expect(doc.storylines).toEqual([
      {
        name: 'Early collapse (illustrative)',
        description: 'Ice retreats.',
        lines: [
          expect.stringMatching(
            /^If this storyline happened, the mean sea level here would be 1\.40 m above MSL 2020 by 2100 \(a rise of 1\.40 m since 2020\); the outlook puts a 5 % chance on a rise above 0\.6\d m by then\.$/,
          ),
        ],
        source: 'Published by Saltglass, version 2: Group (2026)',
      },
    ])
  })
})
