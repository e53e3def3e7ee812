import { describe, expect, it } from 'vitest'
import { EngineInputError, planOutlook, type OutlookInput } from '../../../shared/engine'
import { baseInput, normalComponent } from './helpers'

const quantiles = (levels: number[], values: number[][], anchorYears = [2100]) => ({
  key: 'antarctica',
  release: { form: 'quantiles' as const, baselineYear: 2000, anchorYears, levels, values },
})

function refusal(input: unknown): EngineInputError {
  try {
    planOutlook(input)
  }
  catch (error) {
    expect(error).toBeInstanceOf(EngineInputError)
    return error as EngineInputError
  }
  throw new Error('input was accepted')
}

const gumbel = { location: 1, scale: 0.1 }

const two = [
  normalComponent('a', { 2100: [0.3, 0.1] }),
  normalComponent('b', { 2100: [0.2, 0.1] }),
  normalComponent('c', { 2100: [0.1, 0.1] }),
]

const cases: Array<[string, Partial<OutlookInput> | Record<string, unknown>, string, RegExp]> = [
  [
    'levels repeat',
    { components: [quantiles([0.17, 0.5, 0.5], [[0.1, 0.2, 0.3]])] },
    'components[0].release.levels',
    /strictly increasing in \(0,1\): 0\.5 follows 0\.5/,
  ],
  [
    'level outside (0,1)',
    { components: [quantiles([0, 0.5, 0.9], [[0.1, 0.2, 0.3]])] },
    'components[0].release.levels',
    /0 is outside/,
  ],
  [
    'too few levels',
    { components: [quantiles([0.5, 0.9], [[0.1, 0.2]])] },
    'components[0].release.levels',
    /at least 3/,
  ],
  [
    'values decrease across levels',
    { components: [quantiles([0.17, 0.5, 0.83], [[0.3, 0.2, 0.4]])] },
    'components[0].release.values[0]',
    /non-decreasing/,
  ],
  [
    'row length',
    { components: [quantiles([0.17, 0.5, 0.83], [[0.3, 0.4]])] },
    'components[0].release.values[0]',
    /one value per probability level/,
  ],
  [
    'rows per anchor',
    { components: [quantiles([0.17, 0.5, 0.83], [[0.1, 0.2, 0.3]], [2050, 2100])] },
    'components[0].release.values',
    /one entry per anchor year/,
  ],
  [
    'NaN mean',
    { components: [normalComponent('a', { 2100: [Number.NaN, 0.1] })] },
    'components[0].release.mean[0]',
    /number/,
  ],
  [
    'negative sd',
    { components: [normalComponent('a', { 2100: [0.1, -0.1] })] },
    'components[0].release.sd[0]',
    /zero or more/,
  ],
  ['year past last anchor', { years: [2050, 2110] }, 'years', /ocean-expansion.*2110.*last anchor year 2100/],
  [
    'release starts after outlook',
    { components: [normalComponent('a', { 2100: [0.3, 0.1] }, 2010)] },
    'components[0].release.baselineYear',
    /after the outlook's baseline/,
  ],
  [
    'anchor at release baseline',
    { components: [normalComponent('a', { 2000: [0, 0], 2100: [0.3, 0.1] })] },
    'components[0].release.anchorYears',
    /must come after/,
  ],
  ['years not ascending', { years: [2100, 2050] }, 'years', /strictly increasing/],
  ['year before baseline', { years: [1990, 2050] }, 'years', /before the baseline/],
  ['zero samples', { samples: 0 }, 'samples', /at least 1/],
  ['too many samples', { samples: 2_000_001 }, 'samples', /at most/],
  ['fractional seed', { seed: 1.5 }, 'seed', /whole number/],
  ['duplicate component', { components: [two[0], two[0]] }, 'components[1].key', /duplicate/],
  [
    'reserved key',
    { components: [normalComponent('land-motion', { 2100: [0.3, 0.1] })] },
    'components[0].key',
    /reserved/,
  ],
  [
    'unknown form',
    { components: [{ key: 'a', release: { form: 'triangle', baselineYear: 2000, anchorYears: [2100] } }] },
    'components[0].release.form',
    /.+/,
  ],
  [
    'draw row length',
    {
      components: [
        {
          key: 'a',
          release: { form: 'samples', baselineYear: 2000, anchorYears: [2050, 2100], draws: [[0.1, 0.2], [0.3]] },
        },
      ],
    },
    'components[0].release.draws[1]',
    /one value per anchor year/,
  ],
  [
    'correlation size',
    {
      components: two,
      correlation: [
        [1, 0],
        [0, 1],
      ],
    },
    'correlation',
    /3×3/,
  ],
  [
    'correlation not symmetric',
    {
      components: two,
      correlation: [
        [1, 0.3, 0],
        [0.2, 1, 0],
        [0, 0, 1],
      ],
    },
    'correlation[0][1]',
    /not symmetric/,
  ],
  [
    'correlation diagonal',
    {
      components: two,
      correlation: [
        [1, 0, 0],
        [0, 0.9, 0],
        [0, 0, 1],
      ],
    },
    'correlation[1][1]',
    /diagonal must be 1/,
  ],
  [
    'correlation out of range',
    {
      components: two,
      correlation: [
        [1, 1.2, 0],
        [1.2, 1, 0],
        [0, 0, 1],
      ],
    },
    'correlation[0][1]',
    /\[-1, 1\]/,
  ],
  [
    'correlation not PSD',
    {
      components: two,
      correlation: [
        [1, 0.9, -0.9],
        [0.9, 1, 0.9],
        [-0.9, 0.9, 1],
      ],
    },
    'correlation',
    /not positive semi-definite/,
  ],
  [
    'negative land sigma',
    { landMotion: { rateMmPerYear: -2, sigmaMmPerYear: -1, epoch: 2000 } },
    'landMotion.sigmaMmPerYear',
    /zero or more/,
  ],
  ['heights not ascending', { heights: [0.5, 0.2] }, 'heights', /strictly increasing/],
  ['height step', { heights: { from: 0, to: 1, step: 0 } }, 'heights.step', /positive step/],
  ['tolerance 0', { tolerances: [0] }, 'tolerances[0]', /above 0/],
  ['gumbel scale', { gumbel: { location: 1, scale: 0 } }, 'gumbel.scale', /positive Gumbel scale/],
  [
    'return period',
    { gumbel: { location: 1, scale: 0.1, returnPeriods: [1] } },
    'gumbel.returnPeriods[0]',
    /above 1 year/,
  ],
  [
    'fractional life',
    { thresholds: [{ height: 1, designLifeYears: 2.5 }] },
    'thresholds[0].designLifeYears',
    /whole number/,
  ],
  ['unknown threshold kind', { thresholds: [{ height: 1, kind: 'wave-height' }] }, 'thresholds[0].kind', /.+/],
  [
    'life chance of 1',
    { thresholds: [{ height: 1, designLifeChance: 1 }] },
    'thresholds[0].designLifeChance',
    /below 1/,
  ],
  [
    'flood level without extremes',
    { thresholds: [{ height: 1.2, kind: 'flood-level' }] },
    'thresholds[0].kind',
    /flood level compares the total water level.*extreme-water statistics/,
  ],
  [
    'life on a mean-sea-level threshold',
    { gumbel, thresholds: [{ height: 0.5, designLifeYears: 30, lifeStartYear: 2030 }] },
    'thresholds[0].designLifeYears',
    /make it a flood level/,
  ],
  [
    'life without a start',
    { gumbel, thresholds: [{ height: 1.2, kind: 'flood-level', designLifeYears: 30 }] },
    'thresholds[0].lifeStartYear',
    /needed with designLifeYears.*build year/,
  ],
  [
    'start without a life',
    { gumbel, thresholds: [{ height: 1.2, kind: 'flood-level', lifeStartYear: 2030 }] },
    'thresholds[0].designLifeYears',
    /needed with lifeStartYear/,
  ],
  [
    'life before the reference epoch',
    { gumbel, thresholds: [{ height: 1.2, kind: 'flood-level', designLifeYears: 30, lifeStartYear: 1990 }] },
    'thresholds[0].lifeStartYear',
    /start in 1990, before the reference epoch 2000/,
  ],
  [
    'life past horizon',
    { gumbel, thresholds: [{ height: 1.2, kind: 'flood-level', designLifeYears: 50, lifeStartYear: 2060 }] },
    'thresholds[0].designLifeYears',
    /runs from 2060 to 2109, after the last output year 2100/,
  ],
  [
    'absurd value',
    { components: [normalComponent('a', { 2100: [1e6, 0.1] })] },
    'components[0].release.mean[0]',
    /at most 1000/,
  ],
]

describe('invalid inputs', () => {
  it.each(cases)('%s → EngineInputError naming the field', (_name, overrides, path, message) => {
    const error = refusal({ ...baseInput(), ...overrides })
    const issue = error.issues.find(candidate => candidate.path === path)
    expect(issue, `issues were ${JSON.stringify(error.issues)}`).toBeDefined()
    expect(issue!.message).toMatch(message)
    expect(error.message).toContain(path)
  })

  it('lists several problems at once', () => {
    const error = refusal({ ...baseInput(), samples: 0, seed: -1 })
    expect(error.issues.map(issue => issue.path).sort()).toEqual(['samples', 'seed'])
  })

  it('refuses a non-object input', () => {
    expect(refusal(null).issues.length).toBeGreaterThan(0)
  })

  it('accepts a life of the last output years, from the baseline year, or of the very last one', () => {
    // [practice] L annual maxima from year s are years s … s + L − 1: 2051 + 50 − 1 = 2100
    for (const [lifeStartYear, designLifeYears] of [[2051, 50], [2000, 101], [2100, 1]] as const) {
      const thresholds = [{ height: 1.2, kind: 'flood-level' as const, lifeStartYear, designLifeYears }]
      expect(() => planOutlook({ ...baseInput(), gumbel, thresholds })).not.toThrow()
    }
  })

  it('accepts a perfectly correlated (semi-definite) matrix', () => {
    expect(() =>
      planOutlook({
        ...baseInput(),
        components: two,
        correlation: [
          [1, 1, 1],
          [1, 1, 1],
          [1, 1, 1],
        ],
      }),
    ).not.toThrow()
  })
})
