import jStatPackage from 'jstat'
import { describe, expect, it } from 'vitest'
import { blockStreamState } from '../../../shared/engine/rng'
import { fillNormalScores } from '../../../shared/engine/ziggurat'
import {
  fitGaugeTrend,
  fittedChange,
  GaugeFitError,
  NODAL_PERIOD_YEARS,
  type GaugePoint,
} from '../../../shared/observations/gauge-trend'

const { jStat } = jStatPackage

// Truth for the synthetic records: trend 3.0 mm/yr and acceleration 0.084 mm/yr², the satellite-era
// global estimate [memory: Nerem et al. 2018, PNAS, 3.0 ± 0.4 mm/yr and 0.084 ± 0.025 mm/yr²]; a nodal
// amplitude of 8 mm and AR(1) residuals with φ = 0.5 and a 25 mm residual spread are invented but of a
// gauge's usual size [practice].
const RATE = 0.003
const ACCELERATION = 0.000084
const NODAL_AMPLITUDE = 0.008
const PHI = 0.5
const RESIDUAL_SD = 0.025

function normals(seed: number, count: number): Float64Array {
  const out = new Float64Array(count)
  fillNormalScores(blockStreamState(seed, 0), out, 0, count)
  return out
}

/** Annual means 1966–2025 centred on 1996: trend, acceleration, nodal cycle and stationary AR(1) noise. */
function syntheticRecord(seed: number, years = 60, skip: (year: number) => boolean = () => false): GaugePoint[] {
  const z = normals(seed, years)
  const innovationSd = RESIDUAL_SD * Math.sqrt(1 - PHI * PHI)
  const first = 1966
  const centre = first + 0.5 + (years - 1) / 2
  const points: GaugePoint[] = []
  let noise = RESIDUAL_SD * z[0]!
  for (let i = 0; i < years; i++) {
    if (i > 0) noise = PHI * noise + innovationSd * z[i]!
    const time = first + i + 0.5
    const delta = time - centre
    const height = 1.2 + RATE * delta + (ACCELERATION / 2) * delta * delta
      + NODAL_AMPLITUDE * Math.sin((2 * Math.PI * time) / NODAL_PERIOD_YEARS + 0.7) + noise
    if (!skip(first + i)) points.push({ time, height })
  }
  return points
}

function summary(values: number[]): { mean: number, sd: number } {
  const mean = values.reduce((a, b) => a + b, 0) / values.length
  const sd = Math.sqrt(values.reduce((a, b) => a + (b - mean) ** 2, 0) / (values.length - 1))
  return { mean, sd }
}

describe('fitGaugeTrend', () => {
  it('recovers trend and acceleration over 200 seeds, with standard errors that match their spread', () => {
    const fits = Array.from({ length: 200 }, (_, seed) => fitGaugeTrend(syntheticRecord(seed + 1), 'annual'))
    for (const [estimate, se, truth] of [
      [fits.map(f => f.rate), fits.map(f => f.rateSe), RATE],
      [fits.map(f => f.acceleration), fits.map(f => f.accelerationSe), ACCELERATION],
    ] as const) {
      const spread = summary(estimate)
      // Unbiased: the mean of 200 estimates within 3 standard errors of a mean of 200 [practice].
      expect(Math.abs(spread.mean - truth)).toBeLessThan((3 * spread.sd) / Math.sqrt(200))
      // Reported errors within 25 % of the spread of the estimates (root mean square of the reported SE).
      const reported = Math.sqrt(se.reduce((a, b) => a + b * b, 0) / se.length)
      expect(reported / spread.sd).toBeGreaterThan(0.75)
      expect(reported / spread.sd).toBeLessThan(1.25)
      // About 68 % of the estimates lie within one reported SE of the truth (normal coverage [practice];
      // ±0.1 is three binomial standard errors for 200 seeds).
      const covered = estimate.filter((value, i) => Math.abs(value - truth) <= se[i]!).length / estimate.length
      expect(covered).toBeGreaterThan(0.58)
      expect(covered).toBeLessThan(0.78)
    }
    expect(summary(fits.map(f => f.phi)).mean).toBeGreaterThan(0.35)
    expect(summary(fits.map(f => f.nodalAmplitude)).mean).toBeCloseTo(NODAL_AMPLITUDE, 2)
  })

  it('equals textbook generalised least squares with the AR(1) covariance, gaps included', () => {
    // β = (XᵀΩ⁻¹X)⁻¹ XᵀΩ⁻¹y with Ωᵢⱼ = φ^|tᵢ − tⱼ| (Aitken 1935), computed densely with jStat at the fitted φ.
    const points = syntheticRecord(7, 40, year => year === 1975 || year === 1976 || year === 1990)
    const fit = fitGaugeTrend(points, 'annual')
    const centre = fit.centreTime
    const x = points.map(({ time }) => {
      const angle = (2 * Math.PI * time) / NODAL_PERIOD_YEARS
      return [1, time - centre, (time - centre) ** 2, Math.sin(angle), Math.cos(angle)]
    })
    const omega = points.map(a => points.map(b => fit.phi ** Math.abs(Math.round(a.time - b.time))))
    const omegaInverse = jStat.inv(omega)
    const xt = jStat.transpose(x)
    const xtOmega = jStat.multiply(xt, omegaInverse)
    const beta = jStat.multiply(
      jStat.inv(jStat.multiply(xtOmega, x)),
      jStat.multiply(
        xtOmega,
        points.map(p => [p.height]),
      ),
    )
    beta.forEach(([value], j) => expect(fit.coefficients[j]).toBeCloseTo(value!, 9))
  })

  it('gives an ordinary regression slope its textbook error when the noise is white and has no curve or cycle', () => {
    // A straight line with alternating ±e residuals: φ is pushed to the bound's side of zero, so check the
    // plain OLS case through the slope only: b = Σ(Δ·y)/ΣΔ² for a centred, symmetric design [practice].
    const points = Array.from({ length: 40 }, (_, i) => ({ time: 1980.5 + i, height: 0.002 * (i - 19.5) }))
    const fit = fitGaugeTrend(points, 'annual')
    expect(fit.rate).toBeCloseTo(0.002, 10)
    expect(fit.acceleration).toBeCloseTo(0, 10)
    expect(fit.rateSe).toBeLessThan(1e-9)
  })

  it('fits the seasonal cycle of a monthly record and still recovers the rate', () => {
    const z = normals(99, 12 * 30)
    const points = Array.from({ length: 12 * 30 }, (_, i) => {
      const time = 1990 + (i + 0.5) / 12
      return { time, height: 0.004 * (time - 2005) + 0.05 * Math.cos(2 * Math.PI * time) + 0.02 * z[i]! }
    })
    const fit = fitGaugeTrend(points, 'monthly')
    expect(fit.resolution).toBe('monthly')
    expect(Math.abs(fit.rate - 0.004)).toBeLessThan(3 * fit.rateSe)
  })

  it('refuses a record shorter than one nodal cycle, saying why', () => {
    const points = syntheticRecord(3, 15)
    expect(() => fitGaugeTrend(points, 'annual')).toThrow(GaugeFitError)
    expect(() => fitGaugeTrend(points, 'annual')).toThrow(/at least 19 .*nodal cycle/)
  })

  it('gives the fitted change between two times with the error of its rate and curve terms', () => {
    const fit = fitGaugeTrend(syntheticRecord(11), 'annual')
    const change = fittedChange(fit, fit.centreTime, fit.centreTime + 10)
    // From the centre, the change over 10 years is 10·b + 100·c exactly [practice: the fitted polynomial].
    expect(change.value).toBeCloseTo(10 * fit.rate + 100 * (fit.acceleration / 2), 12)
    expect(change.se).toBeGreaterThan(0)
    expect(fittedChange(fit, 2000, 2000)).toEqual({ value: 0, se: 0 })
  })
})
