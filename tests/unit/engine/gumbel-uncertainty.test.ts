import { describe, expect, it } from 'vitest'
import { runOutlook, type GumbelInput, type OutlookInput } from '../../../shared/engine'
import { baseInput, normalComponent } from './helpers'

const central = { location: 1.5, scale: 0.12 }

function input(gumbel: GumbelInput, rise: [number, number], samples = 20_000): OutlookInput {
  return baseInput({
    years: [2050, 2100],
    samples,
    components: [normalComponent('ocean-expansion', { 2050: [rise[0] / 2, rise[1] / 2], 2100: rise })],
    gumbel,
    thresholds: [
      { kind: 'flood-level', height: 2.6, designLifeYears: 50, lifeStartYear: 2051, designLifeChance: 0.1 },
      { kind: 'flood-level', height: 2.2 },
    ],
  })
}

/** E over the parameter pair of f(μ, λ): midpoint rule on ±7 SE, λ floored at λ/10 as the engine does. */
function parameterExpectation(
  f: (location: number, scale: number) => number,
  locationSe: number,
  scaleSe: number,
  correlation: number,
): number {
  const steps = 200
  const width = 14 / steps
  let total = 0
  for (let a = 0; a < steps; a++) {
    const z1 = -7 + (a + 0.5) * width
    for (let b = 0; b < steps; b++) {
      const z2 = -7 + (b + 0.5) * width
      const scale = Math.max(
        central.scale + scaleSe * (correlation * z1 + Math.sqrt(1 - correlation * correlation) * z2),
        central.scale / 10,
      )
      total += f(central.location + locationSe * z1, scale) * Math.exp(-(z1 * z1 + z2 * z2) / 2) * width * width
    }
  }
  return total / (2 * Math.PI)
}

describe('Gumbel parameter uncertainty', () => {
  it('gives exactly the central outlook when the standard errors are zero', () => {
    // [practice] a parameter distribution with no spread is the central pair.
    const without = runOutlook(input(central, [0.4, 0.1], 4096))
    const zero = runOutlook(
      input({ ...central, locationSe: 0, scaleSe: 0, locationScaleCorrelation: 0.5 }, [0.4, 0.1], 4096),
    )
    expect(JSON.stringify({ ...zero, gumbel: null })).toBe(JSON.stringify({ ...without, gumbel: null }))
  })

  const uncertain = { ...central, locationSe: 0.05, scaleSe: 0.02, locationScaleCorrelation: -0.3 }

  it('raises the life chance of a high level: parameter uncertainty fattens the tail', () => {
    // [practice] E over parameters of a convex tail chance exceeds the chance at the central pair.
    const without = runOutlook(input(central, [0.4, 0.1]))
    const withSe = runOutlook(input(uncertain, [0.4, 0.1]))
    const life = (result: typeof without) => result.thresholds[0]!.lifeExceedance!
    expect(life(withSe).value - life(without).value).toBeGreaterThan(3 * Math.hypot(life(withSe).se, life(without).se))
    expect(withSe.thresholds[0]!.designLifeLevel!.level).toBeGreaterThan(without.thresholds[0]!.designLifeLevel!.level)
  })

  it('matches the annual chance and expected count integrated over the parameters, for a fixed rise', () => {
    // [practice] mean over (μ, λ) ~ bivariate normal of 1 − exp(−e^{(r − (h − μ))/λ}) and of e^{(r − (h − μ))/λ}.
    const rise = 0.4
    const result = runOutlook(input(uncertain, [rise, 0], 100_000))
    const flood = result.thresholds[1]!.flood!
    const chance = parameterExpectation(
      (mu, lambda) => -Math.expm1(-Math.exp((rise - (2.2 - mu)) / lambda)),
      0.05,
      0.02,
      -0.3,
    )
    expect(Math.abs(flood.annualChance[1]!.value - chance)).toBeLessThan(3 * flood.annualChance[1]!.se)
    expect(flood.annualChance[1]!.se).toBeGreaterThan(0)
    const expected = parameterExpectation((mu, lambda) => Math.exp((rise - (2.2 - mu)) / lambda), 0.05, 0.02, -0.3)
    expect(Math.abs(flood.expectedPerYear[1]! / expected - 1)).toBeLessThan(0.03)
    // [practice] today's 100-year level's chance the same way (T-year levels use the trajectory's pair too).
    const hundred = result.byYear[1]!.gumbel!.returnPeriods.find(entry => entry.today === 100)!
    const today = parameterExpectation(
      (mu, lambda) => -Math.expm1(-Math.exp((rise - (hundred.level - mu)) / lambda)),
      0.05,
      0.02,
      -0.3,
    )
    expect(Math.abs(hundred.annualChance.value - today)).toBeLessThan(3 * hundred.annualChance.se)
  })

  it('reports a design-life level whose life chance is the chosen chance', () => {
    // [practice] definition (Rootzén & Katz 2013): the same samples give chance 0.1 at the reported level.
    const first = runOutlook(input(uncertain, [0.4, 0.1]))
    const level = first.thresholds[0]!.designLifeLevel!.level
    const check = input(uncertain, [0.4, 0.1])
    check.thresholds = [{ kind: 'flood-level', height: level, designLifeYears: 50, lifeStartYear: 2051 }]
    const life = runOutlook(check).thresholds[0]!.lifeExceedance!
    expect(Math.abs(life.value - 0.1)).toBeLessThan(5e-4)
  })
})
