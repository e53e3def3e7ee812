import { annualExceedance, annualFactor, factoredExceedance, lifeLogSum, lifeNoExceedance } from './flood-chance'
import { gumbelReturnLevel } from './gumbel'
import { lifeSegments } from './sampler-tables'
import type { LifeSpan, OutlookPlan, ThresholdPlan } from './types'
import type { ValidatedOutlookInput } from './validate'

/**
 * Width of the life histograms' bins in metres of level: a design-life level read from them is within
 * half of it (0.1 mm) of the one from the exact per-sample sums, since shifting every ln Σ e^{rise/λ}
 * by δ shifts the level by λδ.
 */
const LIFE_LEVEL_RESOLUTION = 0.0002
const MAX_LIFE_CELLS = 1 << 18

export interface PlannedThresholds {
  thresholds: ThresholdPlan[]
  lifeSpans: LifeSpan[]
  lifeHistogramSize: number
  /** Without `heavy` and `uncertainty`, which the plan adds. */
  gumbel: Omit<NonNullable<OutlookPlan['gumbel']>, 'heavy' | 'uncertainty'> | null
}

/**
 * Thresholds, their life spans and the Gumbel levels whose annual chances are summed. `low` and `high`
 * bound each output year's rise (they set the life histograms' range); `center` is the all-scores-zero
 * rise, along which the references of the chance sums are taken.
 */
export function planThresholds(
  input: ValidatedOutlookInput,
  cutPosition: (height: number) => number,
  center: Float64Array,
  low: Float64Array,
  high: Float64Array,
): PlannedThresholds {
  const gumbel = input.gumbel
  const levels = gumbel ? gumbel.returnPeriods.map(period => gumbelReturnLevel(gumbel, period)) : []
  const lifeSpans: LifeSpan[] = []
  let lifeHistogramSize = 0
  let lifeSums = 0
  const thresholds = input.thresholds.map((threshold, i): ThresholdPlan => {
    const flood = threshold.kind === 'flood-level' && gumbel !== undefined
    const life = flood && threshold.designLifeYears !== undefined && threshold.lifeStartYear !== undefined
      ? { startYear: threshold.lifeStartYear, years: threshold.designLifeYears }
      : null
    let lifeSpanIndex: number | null = null
    let lifeReference: number | null = null
    if (life && gumbel) {
      lifeSpanIndex = lifeSpans.findIndex(span => span.startYear === life.startYear && span.years === life.years)
      if (lifeSpanIndex < 0) {
        const span = lifeSpan(input, life.startYear, life.years, gumbel.scale, center, low, high, lifeHistogramSize)
        lifeHistogramSize += span.bins + 2
        lifeSpanIndex = lifeSpans.push(span) - 1
      }
      const referenceLogSum = lifeSpans[lifeSpanIndex]!.referenceLogSum
      lifeReference = lifeNoExceedance(referenceLogSum, threshold.height - gumbel.location, 1 / gumbel.scale)
    }
    return {
      key: threshold.key ?? `threshold-${i + 1}`,
      height: threshold.height,
      kind: threshold.kind,
      designLifeYears: life ? life.years : null,
      lifeStartYear: life ? life.startYear : null,
      designLifeChance: threshold.designLifeChance,
      cutIndex: flood ? null : cutPosition(threshold.height),
      levelIndex: flood ? levels.push(threshold.height) - 1 : null,
      lifeSpanIndex,
      lifeSumIndex: lifeSpanIndex === null ? null : lifeSums++,
      lifeReference,
    }
  })
  if (!gumbel) return { thresholds, lifeSpans, lifeHistogramSize, gumbel: null }
  const inverseScale = 1 / gumbel.scale
  const levelFactor = new Float64Array(center.length * levels.length)
  const levelReference = new Float64Array(center.length * levels.length)
  for (let t = 0; t < center.length; t++) {
    for (let k = 0; k < levels.length; k++) {
      const at = t * levels.length + k
      const shift = levels[k]! - gumbel.location
      levelFactor[at] = annualFactor(center[t]!, shift, inverseScale)
      // The loop's arithmetic for a sample on the all-scores-zero trajectory, whose growth is e⁰ = 1.
      levelReference[at]
        = levelFactor[at]! > 0
          ? factoredExceedance(1, levelFactor[at]!)
          : annualExceedance(center[t]!, shift, inverseScale)
    }
  }
  return {
    thresholds,
    lifeSpans,
    lifeHistogramSize,
    gumbel: {
      location: gumbel.location,
      scale: gumbel.scale,
      returnPeriods: [...gumbel.returnPeriods],
      levels,
      levelFactor,
      levelReference,
    },
  }
}

/**
 * A life span's histogram: every sample's ln Σ_years e^{rise/λ} lies within ln L + [lowest, highest rise
 * over the life's knots]/λ (the rise between knots is interpolated), cells centred on multiples of the
 * width from ln L so a life without rise falls on a centre exactly.
 */
function lifeSpan(
  input: ValidatedOutlookInput,
  startYear: number,
  years: number,
  scale: number,
  center: Float64Array,
  low: Float64Array,
  high: Float64Array,
  histogramOffset: number,
): LifeSpan {
  const segments = lifeSegments(input.baselineYear, input.years, startYear, years)
  let lowest = Infinity
  let highest = -Infinity
  for (const segment of segments) {
    for (const knot of [segment.from, segment.to]) {
      lowest = Math.min(lowest, knot < 0 ? 0 : low[knot]!)
      highest = Math.max(highest, knot < 0 ? 0 : high[knot]!)
    }
  }
  let resolution = LIFE_LEVEL_RESOLUTION
  while ((highest - lowest) / resolution + 3 > MAX_LIFE_CELLS) resolution *= 2
  const width = resolution / scale
  const firstBin = Math.floor(lowest / resolution) - 1
  const lastBin = Math.ceil(highest / resolution) + 1
  return {
    startYear,
    years,
    origin: Math.log(years),
    width,
    firstBin,
    bins: lastBin - firstBin + 1,
    histogramOffset,
    referenceLogSum: lifeLogSum(segments, center, 1, 0, 1 / scale),
  }
}
