import { describe, expect, it } from 'vitest'
import { splitRelease } from '../../../shared/releases/parameters'

const years = { baselineYear: 2020, anchorYears: [2050, 2100] }

describe('splitRelease', () => {
  it('keeps only the form-specific numbers as parameters; the form and years have columns of their own', () => {
    const split = splitRelease({ form: 'lognormal', ...years, shift: [0, -0.1], mu: [-2, -1], sigma: [0.3, 0.5] })
    expect(split).toEqual({ parameters: { shift: [0, -0.1], mu: [-2, -1], sigma: [0.3, 0.5] }, draws: null })
  })

  it('sets draws apart (they are stored in a table of their own), leaving no parameters', () => {
    const draws = [[0.1, 0.4], [0.2, 0.5], [0.15, 0.45]]
    expect(splitRelease({ form: 'samples', ...years, draws })).toEqual({ parameters: {}, draws })
  })
})
