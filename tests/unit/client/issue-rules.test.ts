import { describe, expect, it } from 'vitest'
import type { z } from 'zod'
import { SiteSchema } from '../../../shared/schemas/sites'
import {
  CreateCorrelationSetSchema,
  CreateReleaseSchema,
  CreateScaleFactorGridSchema,
} from '../../../shared/schemas/releases'
import { UpdateBriefingSchema } from '../../../shared/schemas/briefings'
import { MAX_TEXT } from '../../../shared/releases/limits'
import { issuePath, issueRule, valueAt } from '../../../utils/issueRules'

const site = {
  name: 'Quay',
  latitude: 48,
  longitude: -33,
  referenceLevel: 'chart datum',
  datum: { kind: 'chart', offset: 1.2 },
  referenceEpoch: 2005,
  landMotion: { rateMmPerYear: -2, sigmaMmPerYear: 0.5, source: 'gps', reference: '', epoch: 2010 },
  thresholds: [{ label: 'Wall', height: 0.5, kind: 'mean-sea-level' }],
}

/** The rule the client recognises in each issue the shared schema gives for this body, by field. */
function rulesFor(schema: z.ZodType, body: unknown) {
  const parsed = schema.safeParse(body)
  if (parsed.success) throw new Error('expected issues')
  return Object.fromEntries(parsed.error.issues.map((issue) => {
    const field = issue.path.map(String).join('.')
    return [field, issueRule(issue.message, valueAt(body, issuePath(field)))]
  }))
}

describe('the schemas\' rules, recognised from their messages', () => {
  it('tells a blank field from a number out of range, a wrong type and an unknown choice', () => {
    const body = {
      ...site, name: '', latitude: null, longitude: 200, referenceEpoch: 1850,
      landMotion: { ...site.landMotion, sigmaMmPerYear: -1, source: 'guess', epoch: 2010.5 },
      thresholds: [{ label: 'Wall', height: 'high', kind: 'mean-sea-level' }],
    }
    expect(rulesFor(SiteSchema, body)).toEqual({
      'name': { rule: 'required' },
      'latitude': { rule: 'required' },
      'longitude': { rule: 'atMost', limit: 180, unit: 'degrees' },
      'referenceEpoch': { rule: 'atLeast', limit: 1900, unit: '' },
      'landMotion.sigmaMmPerYear': { rule: 'atLeast', limit: 0, unit: 'mm/yr' },
      'landMotion.source': { rule: 'choose' },
      'landMotion.epoch': { rule: 'wholeYear' },
      'thresholds.0.height': { rule: 'number' },
    })
  })

  it('recognises the release editor\'s blanks, choices and lengths, and leaves the engine\'s own checks to the server\'s words', () => {
    const body = {
      series: { component: 'sea-monsters', scenario: 'SSP2-4.5', title: 'x'.repeat(500) },
      form: 'normal',
      unit: 'm',
      baselineYear: 2020,
      anchorYears: [2050],
      mean: [null],
      sd: [0.1],
      method: '',
      citation: 'c',
      licence: 'CC BY 4.0',
    }
    expect(rulesFor(CreateReleaseSchema, body)).toEqual({
      'series.component': { rule: 'choose' },
      'series.title': { rule: 'tooLong', limit: MAX_TEXT.title },
      'mean.0': { rule: 'required' },
      'method': { rule: 'required' },
    })
    expect(
      issueRule('must be non-decreasing across levels: 0.2 (level 0.5) follows 0.3 (level 0.17)', [0.3, 0.2]),
    ).toBeNull()
  })

  it('recognises the correlation-set, scale-factor-grid and briefing forms\' blanks and empty choices', () => {
    const provenance = { method: '', citation: 'c', licence: 'CC BY 4.0' }
    expect(
      rulesFor(CreateCorrelationSetSchema, {
        scenario: '',
        title: '',
        components: ['glaciers', 'greenland'],
        matrix: [
          [1, 0],
          [0, 1],
        ],
        ...provenance,
      }),
    ).toEqual({
      scenario: { rule: 'required' },
      title: { rule: 'required' },
      method: { rule: 'required' },
    })
    expect(
      rulesFor(CreateScaleFactorGridSchema, { component: '', title: 'Grid', csv: 'latitude,0\n0,1', ...provenance }),
    ).toEqual({
      component: { rule: 'choose' },
      method: { rule: 'required' },
    })
    const briefing = {
      title: 'Quay',
      audience: '',
      localContext: '',
      language: 'en',
      units: 'm',
      thresholdIds: [],
      years: [],
      comparisonOutlookIds: [],
    }
    expect(rulesFor(UpdateBriefingSchema, briefing)).toEqual({
      thresholdIds: { rule: 'chooseSome' },
      years: { rule: 'chooseSome' },
    })
  })

  it('finds the value an issue names, whatever way the field is written', () => {
    const body = { values: [[1, 2]], csv: 'year,value' }
    expect(valueAt(body, issuePath('values[0]'))).toEqual([1, 2])
    expect(valueAt(body, issuePath('values.0.1'))).toBe(2)
    expect(issuePath('csv row 3, column year')).toEqual(['csv'])
    expect(valueAt(body, issuePath('body'))).toBeUndefined()
  })
})
