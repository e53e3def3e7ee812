import { describe, expect, it } from 'vitest'
import { planOutlook, runBlocks } from '../../../shared/engine'
import type { ComponentInput } from '../../../shared/engine'
import { annualCounts } from '../../../shared/engine/tile-triggers'
import { planTrajectories, sampleTrajectories } from '../../../shared/engine/trajectories'
import { baseInput, normalComponent } from './helpers'

// Trajectories must be the outlook's own samples: counting them year by year above a height must give
// exactly the engine's annual trigger counts for the same input.

const draws: ComponentInput = {
  key: 'antarctica',
  scale: 1.2,
  release: {
    form: 'samples',
    baselineYear: 1995,
    anchorYears: [2050, 2100],
    draws: Array.from({ length: 40 }, (_, k) => [0.002 * k, 0.006 * k]),
  },
}

describe('trajectories of an outlook', () => {
  it.each([
    ['a normal release', [] as ComponentInput[]],
    ['uploaded draws (rises formed from levels)', [draws]],
  ])('count above a height year by year as the engine does (%s)', (_, extra) => {
    const input = baseInput({
      baselineYear: 2000,
      years: [2030, 2060, 2100],
      samples: 5000,
      components: [normalComponent('ocean-expansion', { 2050: [0.1, 0.03], 2100: [0.3, 0.08] }), ...extra],
      landMotion: { rateMmPerYear: -1, sigmaMmPerYear: 0.5, epoch: 2000 },
      thresholds: [{ height: 0.1 }, { height: 0.25 }],
    })
    const plan = planOutlook(input)
    const merged = runBlocks(plan, 0, plan.blockCount)
    const trajectories = sampleTrajectories(planTrajectories(input as Record<string, unknown>), 5000)
    expect(trajectories.firstYear).toBe(2000)
    expect(trajectories.yearCount).toBe(101)
    for (const [m, height] of [0.1, 0.25].entries()) {
      // Output years are checked through the trigger counts' own years between them (the engine takes
      // output years from its histogram cells), so compare the years that are not output years.
      const engine = annualCounts(plan, merged.triggerCounts, m, () => Number.NaN)
      for (let y = 1; y < trajectories.yearCount; y++) {
        if (Number.isNaN(engine[y]!)) continue
        let above = 0
        for (let i = 0; i < trajectories.count; i++)
          if (trajectories.rise[i * trajectories.yearCount + y]! > height) above++
        expect(above, `year ${2000 + y}, height ${height}`).toBe(engine[y])
      }
    }
  })

  it('gives the outlook\'s first samples however many are asked', () => {
    const input = baseInput({ samples: 5000 }) as Record<string, unknown>
    const plan = planTrajectories(input)
    const all = sampleTrajectories(plan, 5000)
    const some = sampleTrajectories(plan, 2100)
    const differing = some.rise.findIndex((value, k) => value !== all.rise[k])
    expect(some.rise.length).toBe(2100 * all.yearCount)
    expect(differing).toBe(-1)
  })

  it('refuses more trajectories than the outlook has', () => {
    const plan = planTrajectories(baseInput({ samples: 100 }) as Record<string, unknown>)
    expect(() => sampleTrajectories(plan, 101)).toThrow(/1 to 100/)
  })
})
