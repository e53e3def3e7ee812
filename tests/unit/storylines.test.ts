import { describe, expect, it } from 'vitest'
import { storylineBasis, storylineRise, valueAt } from '../../shared/storylines/rise'
import { runOutlook } from '../../shared/engine'
import { baseInput, normalComponent } from './engine/helpers'

describe('a storyline at a site', () => {
  const input = baseInput({
    baselineYear: 2020,
    years: [2020, 2050, 2100],
    components: [
      normalComponent('ocean-expansion', { 2100: [0.4, 0.1] }, 2020),
      normalComponent('antarctica', { 2100: [0.2, 0.15] }, 2020),
    ],
    landMotion: { rateMmPerYear: -2, sigmaMmPerYear: 0.5, epoch: 2020 },
  })
  const storyline = { name: 'Early collapse', baselineYear: 2020, anchorYears: [2100], values: { antarctica: [1] } }

  it('takes the storyline’s values where it names a component and the middle estimate elsewhere', () => {
    // [practice] 2100: ocean 0.4 (its mean) + Antarctica 1.0 (the storyline) + sinking 2 mm/yr × 80 = 1.56 m;
    // 2050 is 30/80 of each linear path: 0.15 + 0.375 + 0.06 = 0.585 m.
    const rises = storylineRise(storyline, storylineBasis(input))
    expect(rises.map(r => r.year)).toEqual([2050, 2100])
    expect(rises[0]!.rise).toBeCloseTo(0.585, 12)
    expect(rises[1]!.rise).toBeCloseTo(1.56, 12)
  })

  it('scales the storyline’s values by the site’s factor and stops at its last anchor year', () => {
    const scaled = {
      ...input,
      years: [2020, 2100, 2150],
      components: [
        normalComponent('ocean-expansion', { 2150: [0.6, 0.1] }, 2020),
        { ...normalComponent('antarctica', { 2150: [0.3, 0.1] }, 2020), scale: 1.2 },
      ],
    }
    // [practice] 2100: ocean 0.6·80/130 + 1.2 × 1.0 + 0.16 m; 2150 is past the storyline's last anchor.
    const rises = storylineRise(storyline, storylineBasis(scaled))
    expect(rises).toHaveLength(1)
    expect(rises[0]!.rise).toBeCloseTo(0.6 * 80 / 130 + 1.2 + 0.16, 12)
  })

  it('is a what-if beside the outlook, not part of it: the chances do not move', () => {
    // The storyline is computed from the outlook's input alone and never reaches the engine.
    const before = JSON.stringify(runOutlook({ ...input, samples: 4096 }))
    storylineRise(storyline, storylineBasis(input))
    expect(JSON.stringify(runOutlook({ ...input, samples: 4096 }))).toBe(before)
  })

  it('interpolates in time from zero at its baseline year', () => {
    expect(valueAt(2020, [2050, 2100], [0.3, 1.3], 2035)).toBeCloseTo(0.15, 12)
    expect(valueAt(2020, [2050, 2100], [0.3, 1.3], 2075)).toBeCloseTo(0.8, 12)
    expect(valueAt(2020, [2050, 2100], [0.3, 1.3], 2101)).toBeNull()
  })
})
