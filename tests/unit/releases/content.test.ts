import { describe, expect, it } from 'vitest'
import { amountToMetres } from '../../../shared/releases/amounts'
import { buildRelease, ReleaseContentError } from '../../../shared/releases/content'
import { interpolateFactor, gridErrors, gridWarnings } from '../../../shared/releases/grid'

const issuesOf = (run: () => unknown) => {
  try {
    run()
  }
  catch (error) {
    if (error instanceof ReleaseContentError) return error.issues
    throw error
  }
  throw new Error('expected a ReleaseContentError')
}

describe('amounts', () => {
  it('converts ice mass to global mean rise at about 362 Gt per millimetre', () => {
    // [pub] ocean area ≈ 3.62e14 m² (Cogley 2012, Marine Geodesy): 362 Gt of ice ≈ 1 mm of rise.
    expect(amountToMetres(362, 'Gt')).toBeCloseTo(0.001, 9)
    // [pub] same source: 1000 Gt ≈ 2.76 mm.
    expect(amountToMetres(1000, 'Gt') * 1000).toBeCloseTo(2.76, 2)
    expect(amountToMetres(25, 'mm')).toBe(0.025)
    expect(amountToMetres(0.4, 'm')).toBe(0.4)
  })
})

describe('building a release from what an analyst entered', () => {
  it('converts a normal release entered in gigatonnes into metres, mean and sd alike', () => {
    const release = buildRelease({
      form: 'normal',
      unit: 'Gt',
      baselineYear: 2020,
      anchorYears: [2100],
      mean: [36200],
      sd: [3620],
    })
    expect(release).toMatchObject({ form: 'normal', anchorYears: [2100] })
    expect((release as { mean: number[] }).mean[0]).toBeCloseTo(0.1, 9)
    expect((release as { sd: number[] }).sd[0]).toBeCloseTo(0.01, 9)
  })

  it('reads a quantile CSV and checks it with the engine rules', () => {
    const issues = issuesOf(() =>
      buildRelease({
        form: 'quantiles',
        unit: 'm',
        baselineYear: 2020,
        csv: 'level,2050\n0.17,0.3\n0.5,0.2\n0.83,0.4\n',
      }),
    )
    expect(issues[0]!.field).toBe('values[0]')
    expect(issues[0]!.message).toMatch(/non-decreasing across levels: 0.2 \(level 0.5\) follows 0.3/)
  })

  it('refuses lognormal parameters in another unit than metres, and CSV for a normal form', () => {
    expect(
      issuesOf(() =>
        buildRelease({
          form: 'lognormal',
          unit: 'Gt',
          baselineYear: 2020,
          anchorYears: [2100],
          shift: [0],
          mu: [-2],
          sigma: [0.3],
        }),
      )[0]!.field,
    ).toBe('unit')
    expect(
      issuesOf(() => buildRelease({ form: 'normal', unit: 'm', baselineYear: 2020, csv: '2050\n0.1\n' }))[0]!.message,
    ).toMatch(/CSV upload is for quantile tables and draws/)
  })

  it('refuses an anchor year at or before the baseline, and a missing value per anchor', () => {
    expect(
      issuesOf(() =>
        buildRelease({ form: 'normal', unit: 'm', baselineYear: 2050, anchorYears: [2050], mean: [0.1], sd: [0.01] }),
      )[0]!.message,
    ).toMatch(/must come after the release's baseline year 2050/)
    expect(
      issuesOf(() =>
        buildRelease({
          form: 'normal',
          unit: 'm',
          baselineYear: 2020,
          anchorYears: [2050, 2100],
          mean: [0.1],
          sd: [0.01, 0.02],
        }),
      )[0],
    ).toEqual({ field: 'mean', message: 'needs one entry per anchor year (2), got 1' })
  })
})

describe('scale-factor grids', () => {
  const grid = { latitudes: [-10, 10], longitudes: [0, 20], factors: [[1, 2], [3, 4]] }

  it('interpolates bilinearly inside the grid and gives null outside', () => {
    // [practice] bilinear interpolation: the centre of a cell is the mean of its corners.
    expect(interpolateFactor(grid, 0, 10)).toBeCloseTo(2.5, 12)
    expect(interpolateFactor(grid, -10, 0)).toBe(1)
    expect(interpolateFactor(grid, 10, 20)).toBe(4)
    expect(interpolateFactor(grid, 0, 5)).toBeCloseTo(2.25, 12)
    expect(interpolateFactor(grid, 20, 10)).toBeNull()
  })

  it('wraps longitudes given on the other convention (0–360 against −180–180)', () => {
    const global = { latitudes: [-90, 90], longitudes: [-180, 180], factors: [[1, 1], [1, 1]] }
    expect(interpolateFactor(global, 0, 300)).toBe(1)
  })

  it('refuses latitudes out of range and ragged rows, and warns on implausible factors', () => {
    expect(gridErrors({ latitudes: [0, 95], longitudes: [0, 1], factors: [[1, 1], [1]] }).map(e => e.field)).toEqual([
      'latitudes[1]',
      'factors[1]',
    ])
    expect(
      gridWarnings({
        latitudes: [0, 10],
        longitudes: [0, 10],
        factors: [
          [5, 5],
          [5, 5],
        ],
      }).join(' '),
    ).toMatch(/outside -1…2.*mean factor is 5.00/)
    expect(gridWarnings({ latitudes: [0, 10], longitudes: [0, 10], factors: [[1, 1.1], [0.9, 1]] })).toEqual([])
  })
})
