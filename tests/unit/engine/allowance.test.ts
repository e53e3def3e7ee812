import { describe, expect, it } from 'vitest'
import { runOutlook, standardNormalQuantile, type ComponentInput, type YearGumbel } from '../../../shared/engine'
import { baseInput, normalComponent } from './helpers'

const lambda = 0.1

function yearGumbel(components: ComponentInput[], samples: number): { baseline: YearGumbel, last: YearGumbel } {
  const result = runOutlook(
    baseInput({ years: [2000, 2100], samples, components, gumbel: { location: 1, scale: lambda } }),
  )
  return { baseline: result.byYear[0]!.gumbel!, last: result.byYear[1]!.gumbel! }
}

/** ∫ φ(z) f(z) dz by the midpoint rule over ±8. */
function normalIntegral(f: (z: number) => number): number {
  const steps = 8000
  let total = 0
  for (let k = 0; k < steps; k++) {
    const z = -8 + (16 * (k + 0.5)) / steps
    total += f(z) * Math.exp((-z * z) / 2) * (16 / steps)
  }
  return total / Math.sqrt(2 * Math.PI)
}

describe('allowance and amplification with standard errors', () => {
  const normal = [normalComponent('ocean-expansion', { 2100: [0.5, 0.15] })]

  it.each([10_000, 100_000, 1_000_000])(
    'gives Hunter’s μ + σ²/(2λ) for a normal rise within 3 SE at %i samples',
    (samples) => {
      // [memory: Hunter 2012, Climatic Change 113; CHECKS.md] A = μ + σ²/(2λ): 0.5, 0.15, 0.1 → 0.6125 m.
      const { last } = yearGumbel(normal, samples)
      expect(last.settled).toBe(true)
      expect(last.unsettledReason).toBeUndefined()
      expect(Math.abs(last.allowance - 0.6125)).toBeLessThan(3 * last.allowanceSe)
      // [practice] amplification E[e^{rise/λ}] = e^{A/λ} for the same normal.
      expect(Math.abs(last.amplification - Math.exp(0.6125 / lambda))).toBeLessThan(3 * last.amplificationSe)
      // [practice] e^{rise/λ} is lognormal with log-sd σ/λ = 1.5: sd/mean = √(e^{2.25} − 1) = 2.914, so
      // se(A) ≈ λ·2.914/√N; the sample sd of such a tail is itself noisy, hence the wide band.
      const expectedSe = (lambda * Math.sqrt(Math.expm1(2.25))) / Math.sqrt(samples)
      expect(last.allowanceSe).toBeGreaterThan(0.5 * expectedSe)
      expect(last.allowanceSe).toBeLessThan(2 * expectedSe)
    },
  )

  it('reports zero standard errors for a rise without spread', () => {
    // [practice] a fixed rise Δ: allowance Δ, amplification e^{Δ/λ} = e³ = 20.09 for Δ = 0.3 (CHECKS.md).
    const { last } = yearGumbel([normalComponent('ocean-expansion', { 2100: [0.3, 0] })], 4096)
    expect(last.allowance).toBeCloseTo(0.3, 12)
    expect(last.amplification).toBeCloseTo(20.09, 2)
    expect(last.allowanceSe).toBe(0)
    expect(last.amplificationSe).toBe(0)
  })

  describe('a lognormal part', () => {
    const release = {
      form: 'lognormal' as const,
      baselineYear: 2000,
      anchorYears: [2100],
      shift: [0],
      mu: [Math.log(0.2)],
      sigma: [0.5],
    }
    const lognormal: ComponentInput[] = [{ key: 'antarctica', scale: 1, release }]
    const small = yearGumbel(lognormal, 10_000)
    const large = yearGumbel(lognormal, 100_000)
    const largest = yearGumbel(lognormal, 1_000_000)

    it('is marked unsettled, and the capped values agree across 10k, 100k and 1M samples within 3 SE', () => {
      expect(large.last.settled).toBe(false)
      expect(large.last.unsettledReason).toBe('heavy-tail')
      expect(large.baseline.settled).toBe(true)
      // [practice; issue check] Monte Carlo estimates of one finite quantity: every pair within 3 combined SE
      // (the uncapped E[e^{rise/λ}] is infinite, and its estimate would grow with N instead).
      const runs = [small, large, largest].map(run => run.last)
      for (const [a, b] of [[0, 1], [0, 2], [1, 2]] as const) {
        const se = Math.hypot(runs[a]!.allowanceSe, runs[b]!.allowanceSe)
        expect(Math.abs(runs[a]!.allowance - runs[b]!.allowance)).toBeLessThan(3 * se)
        expect(Math.abs(runs[a]!.amplification - runs[b]!.amplification)).toBeLessThan(
          3 * Math.hypot(runs[a]!.amplificationSe, runs[b]!.amplificationSe),
        )
      }
      for (const run of runs) expect(run.allowanceSe).toBeGreaterThan(0)
    })

    it('matches the capped rise’s λ·ln E[e^{rise/λ}] integrated directly', () => {
      // [practice] the stated convention: the lognormal held at its score-Φ⁻¹(0.999) value beyond it.
      const cap = standardNormalQuantile(0.999)
      const mean = normalIntegral(z =>
        Math.exp(Math.exp(release.mu[0]! + release.sigma[0]! * Math.min(z, cap)) / lambda),
      )
      expect(cap).toBeCloseTo(3.0902, 4)
      expect(Math.abs(large.last.allowance - lambda * Math.log(mean))).toBeLessThan(3 * large.last.allowanceSe)
    })
  })
})
