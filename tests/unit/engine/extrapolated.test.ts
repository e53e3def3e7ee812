import { describe, expect, it } from 'vitest'
import { runOutlook, standardNormalQuantile, type ComponentInput } from '../../../shared/engine'
import { baseInput, normalComponent } from './helpers'

// [practice, DESIGN.md vocabulary "extrapolated"] an output that depends on a release beyond its
// outermost published level is marked; here levels 5–95 %, so the 1st and 99th percentiles are beyond.
function quantileComponent(key: string, levels: number[], median: number, sd: number): ComponentInput {
  return {
    key,
    scale: 1,
    release: {
      form: 'quantiles',
      baselineYear: 2000,
      anchorYears: [2100],
      levels,
      values: [levels.map(p => median + sd * standardNormalQuantile(p))],
    },
  }
}

describe('extrapolated percentiles and chances', () => {
  const levels = [0.05, 0.17, 0.5, 0.83, 0.95]

  it('marks levels beyond a dominant quantile release’s outermost levels, and chances that need them', () => {
    // [practice] rise ~ N(0.5, 0.1): P(rise > 0.7) = 1 − Φ(2) = 0.023 sits at level 0.977 > 0.95;
    // P(rise > 0.55) = 1 − Φ(0.5) = 0.31 at level 0.69, inside.
    const result = runOutlook(
      baseInput({
        years: [2000, 2100],
        components: [quantileComponent('antarctica', levels, 0.5, 0.1)],
        thresholds: [{ height: 0.7 }, { height: 0.55 }],
      }),
    )
    const year = result.byYear[1]!
    expect(year.percentiles.map(p => p.extrapolated)).toEqual([true, false, false, false, false, false, true])
    expect(result.thresholds[0]!.byYear[1]!.extrapolated).toBe(true)
    expect(result.thresholds[1]!.byYear[1]!.extrapolated).toBe(false)
    // The height grid (0, 0.1, … 1 m) carries the same mark where it is true: 0.7 m (level 0.977) yes, 0.5 m (level
    // 0.5) no.
    const at = (h: number) => year.exceedance[result.heights.findIndex(x => Math.abs(x - h) < 1e-9)]!
    expect(at(0.7).extrapolated).toBe(true)
    expect(at(0.5).extrapolated).toBeUndefined()
    // The baseline year has no spread, so nothing rests on any release there.
    expect(result.byYear[0]!.percentiles.every(p => p.extrapolated === false)).toBe(true)
  })

  it('marks trigger years that rest on a level beyond the releases', () => {
    // [practice] rise ~ N(0.5·(t − 2000)/100, (0.1·(t − 2000)/100)²); the 1 % trigger rests on level 0.99,
    // beyond 0.95; the 50 % trigger on level 0.5, inside.
    const result = runOutlook(
      baseInput({
        years: [2000, 2050, 2100],
        components: [quantileComponent('antarctica', levels, 0.5, 0.1)],
        thresholds: [{ height: 0.3 }],
      }),
    )
    const triggers = result.thresholds[0]!.triggerYears
    expect(triggers.find(entry => entry.tolerance === 0.01)!.extrapolated).toBe(true)
    expect(triggers.find(entry => entry.tolerance === 0.5)!.extrapolated).toBe(false)
  })

  it('folds one-sided tables so that both tails count, and ignores a release with a negligible share', () => {
    // [practice] levels 17–95 %: with a negative scale its 95 % is the rise's 5 %, so only 17–83 % is covered both
    // ways.
    const oneSided = runOutlook(
      baseInput({ years: [2100], components: [quantileComponent('glaciers', [0.17, 0.5, 0.95], 0.5, 0.1)] }),
    )
    expect(oneSided.byYear[0]!.percentiles.map(p => p.extrapolated)).toEqual([
      true,
      true,
      false,
      false,
      false,
      true,
      true,
    ])
    // A quantile release with variance share (0.01/1.01)² ≈ 1e-4 of the rise, far below 5 %.
    const small = runOutlook(
      baseInput({
        years: [2100],
        components: [
          normalComponent('ocean-expansion', { 2100: [0.5, 1] }),
          quantileComponent('land-water', levels, 0.03, 0.01),
        ],
      }),
    )
    expect(small.byYear[0]!.varianceShare!['land-water']!).toBeLessThan(0.05)
    expect(small.byYear[0]!.percentiles.every(p => p.extrapolated === false)).toBe(true)
  })

  it('marks an observation-updated chance at a height beyond the releases as the outlook\'s own', () => {
    // [practice] the tail a height sits in is a property of the height and the year, not of the weights:
    // 0.7 m in 2100 is at level 0.977 of the outlook, beyond 0.95, however a gauge record shifts the chance.
    const times = [2000, 2005, 2010, 2015, 2020]
    const result = runOutlook(
      baseInput({
        years: [2000, 2100],
        samples: 20_000,
        components: [quantileComponent('antarctica', levels, 0.5, 0.1)],
        thresholds: [{ key: 'high', height: 0.7 }, { key: 'mid', height: 0.55 }],
        observations: { times, rise: times.map(t => 0.006 * (t - 2000)), residualSd: 0.02, phi: 0 },
      }),
    )
    const update = result.observationUpdate!
    if (update.refused) throw new Error('update refused')
    const flag = (key: string) => update.thresholds.find(th => th.key === key)!.byYear[1]!.extrapolated ?? false
    expect(flag('high')).toBe(true)
    expect(flag('mid')).toBe(false)
  })
})
