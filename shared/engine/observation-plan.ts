import { landRiseLine, type LandMotionLine } from './land-motion'
import { relativeAnchorWeights } from './timeline'
import type { ObservationPlan, TriggerPlan } from './types'
import type { ValidatedOutlookInput } from './validate'

// Likelihood weighting (importance weighting with the prior as proposal): every trajectory is weighted
// by the Gaussian AR(1) likelihood of the observed record given that trajectory's rise, so weighted
// statistics describe the outlook conditioned on what the gauge has seen.
//
// Residuals e_i = y_i − rise(t_i) follow AR(1) with marginal sd s and correlation φ per step; across
// kᵢ steps (gaps allowed) the exact whitening (Prais–Winsten, uneven steps, as the gauge fit uses)
//   w₀ = e₀ / s,  wᵢ = (eᵢ − φ^kᵢ·eᵢ₋₁) / (s·√(1 − φ^(2kᵢ)))
// makes the wᵢ independent standard normals, so ln L = −½ Σ wᵢ² + const. The rise at any time is linear
// in the sample's basis rows x (rise(t) = a(t) + Σ_j W_j(t)·x_j), so with Ã = whitened W and
// d̃ = whitened (y − a):
//   ln L = −½|d̃ − Ãx|² = const + (Ãᵀd̃)ᵀx − ½ xᵀ(ÃᵀÃ)x
// The matrices are formed once per plan; a sample costs one multiply-add per non-zero term.

export interface ObservationShape {
  years: number
  cuts: number
  histogramSize: number
  trigger: TriggerPlan | null
}

/**
 * The quadratic form of the record's log-likelihood in the basis rows, and the layout of the weighted
 * sums. `groups` lists each basis column group's first column and a release with its time weights.
 */
export function planObservations(
  input: ValidatedOutlookInput,
  land: LandMotionLine,
  groups: Array<{ firstColumn: number, release: { baselineYear: number, anchorYears: number[] } }>,
  basisCount: number,
  valueBasis: Int32Array,
  valueAtZero: Float64Array,
  shape: ObservationShape,
): ObservationPlan | null {
  const observed = input.observations
  if (!observed || observed.times.length === 0) return null
  const times = observed.times
  const count = times.length
  const baseline = input.baselineYear
  const landColumn = basisCount - 1
  // Per observation: the basis weights at its time, and the rise's intercepts (levels and centred).
  const weight = new Float64Array(count * basisCount)
  for (const group of groups) {
    const rows = relativeAnchorWeights(group.release.baselineYear, group.release.anchorYears, baseline, times)
    for (let i = 0; i < count; i++) weight.set(rows[i]!, i * basisCount + group.firstColumn)
  }
  const landIntercept = new Float64Array(count)
  const center = new Float64Array(count)
  for (let i = 0; i < count; i++) {
    const elapsed = times[i]! - baseline
    const rise = landRiseLine(land, elapsed)
    landIntercept[i] = input.landMotion ? rise.intercept : 0
    weight[i * basisCount + landColumn] = input.landMotion ? rise.slope : 0
    center[i] = landIntercept[i]!
    for (let slot = 0; slot < valueBasis.length; slot++)
      center[i]! += weight[i * basisCount + valueBasis[slot]!]! * valueAtZero[slot]!
  }

  // Whitened rows, then Ãᵀd̃ (both intercepts) and ÃᵀÃ.
  const linearCentred = new Float64Array(basisCount)
  const linearLevels = new Float64Array(basisCount)
  const gram = new Float64Array(basisCount * basisCount)
  const row = new Float64Array(basisCount)
  for (let i = 0; i < count; i++) {
    let carry = 0
    let scale = 1 / observed.residualSd
    if (i > 0) {
      const steps = Math.round((times[i]! - times[i - 1]!) / observed.stepYears)
      carry = observed.phi ** steps
      scale /= Math.sqrt(1 - carry * carry)
    }
    for (let j = 0; j < basisCount; j++) {
      const previous = i > 0 ? weight[(i - 1) * basisCount + j]! : 0
      row[j] = (weight[i * basisCount + j]! - carry * previous) * scale
    }
    const residual = (intercept: Float64Array) =>
      (observed.rise[i]! - intercept[i]! - (i > 0 ? carry * (observed.rise[i - 1]! - intercept[i - 1]!) : 0)) * scale
    const centred = residual(center)
    const levels = residual(landIntercept)
    for (let j = 0; j < basisCount; j++) {
      linearCentred[j]! += row[j]! * centred
      linearLevels[j]! += row[j]! * levels
      for (let k = 0; k <= j; k++) gram[j * basisCount + k]! += row[j]! * row[k]!
    }
  }
  const termFirst: number[] = []
  const termSecond: number[] = []
  const termCoefficient: number[] = []
  for (let j = 0; j < basisCount; j++) {
    for (let k = 0; k <= j; k++) {
      const value = gram[j * basisCount + k]!
      if (value === 0) continue
      termFirst.push(j)
      termSecond.push(k)
      termCoefficient.push(j === k ? -value / 2 : -value)
    }
  }

  const counted = shape.trigger ? shape.trigger.heights.length : 0
  const momentsAt = 2
  const cellsAt = momentsAt + basisCount + basisCount * basisCount
  const triggerAt = cellsAt + shape.years * (shape.cuts + 1)
  const histogramAt = triggerAt + (shape.trigger ? counted * (shape.trigger.yearCount + 1) : 0)
  return {
    count,
    firstTime: times[0]!,
    lastTime: times[count - 1]!,
    residualSd: observed.residualSd,
    phi: observed.phi,
    reach: observed.reach,
    linearCentred,
    linearLevels,
    termFirst: Int32Array.from(termFirst),
    termSecond: Int32Array.from(termSecond),
    termCoefficient: Float64Array.from(termCoefficient),
    momentsAt,
    cellsAt,
    triggerAt,
    histogramAt,
    size: histogramAt + shape.histogramSize,
  }
}
