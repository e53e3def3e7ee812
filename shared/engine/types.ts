// Shapes shared by the planning, sampling and summary steps. A plan and a partial hold only numbers,
// strings and typed arrays, so both cross a worker boundary by structured clone (partials' buffers
// can be transferred).

import type { LandDrawPlan } from './land-motion'
import type { RecordReach, RecordReachMode } from './observation-reach'

export const COMPONENT_KIND_PIECEWISE = 0
export const COMPONENT_KIND_LOGNORMAL = 1
export const COMPONENT_KIND_DRAWS = 2
export type ComponentKind
  = typeof COMPONENT_KIND_PIECEWISE | typeof COMPONENT_KIND_LOGNORMAL | typeof COMPONENT_KIND_DRAWS

export const LAND_MOTION_KEY = 'land-motion'

export type ThresholdKind = 'mean-sea-level' | 'flood-level'

export interface ThresholdPlan {
  key: string
  height: number
  kind: ThresholdKind
  designLifeYears: number | null
  lifeStartYear: number | null
  designLifeChance: number
  /** Index of this height in `cuts` (mean-sea-level only, else null). */
  cutIndex: number | null
  /** Index of this height in `gumbel.levels` (flood-level only, else null). */
  levelIndex: number | null
  /** Index into `lifeSpans` (flood levels with a design life, else null). */
  lifeSpanIndex: number | null
  /** Which pair of life sums after `sumLayout.lifeNoExceedance` is this threshold's (null when none). */
  lifeSumIndex: number | null
  /** Chance of no exceedance during the life along the all-scores-zero trajectory: the life sums' reference. */
  lifeReference: number | null
}

/**
 * A run of L annual maxima, years startYear … startYear + L − 1, and the histogram of each sample's
 * ln Σ_years e^{rise/λ} over it, cells [underflow, bins…, overflow] from `histogramOffset` in
 * `OutlookPartial.lifeHistogram`. Bin k (1-based) holds values within half a width of
 * origin + (firstBin + k − 1)·width; origin is ln L, the value for no rise.
 */
export interface LifeSpan {
  startYear: number
  years: number
  origin: number
  width: number
  firstBin: number
  bins: number
  histogramOffset: number
  /** ln Σ_years e^{rise/λ} along the all-scores-zero trajectory. */
  referenceLogSum: number
}

/**
 * Annual trigger years: the rise is linear in time between knots (see `planTriggers`), so each sample's
 * exceedance of a mean-sea-level threshold over a knot interval is a run of years at one end, counted
 * as +1/−1 in a per-threshold difference array over the calendar years firstYear … firstYear + yearCount − 1.
 */
export interface TriggerPlan {
  firstYear: number
  yearCount: number
  /** Ascending; the first is the baseline year (rise 0), the last the last output year. */
  knotYears: Int32Array
  /** 1 where a knot is an output year: its count is the output year's exact one, not counted again. */
  knotIsOutput: Uint8Array
  /** Per knot, the weight of each basis column (row-major, knots × basisCount). */
  knotWeight: Float64Array
  /**
   * Per knot, the basis columns with a non-zero weight, padded to passes of four with the zero row
   * (index basisCount, weight 0): knotColumns[knotColumnStart[k] … knotColumnStart[k + 1]), weights alike.
   */
  knotColumns: Int32Array
  knotColumnWeight: Float64Array
  knotColumnStart: Int32Array
  /** Rise at each knot when every score is zero (intercept over the centred basis). */
  knotCenter: Float64Array
  /** Land motion's intercept at each knot (intercept over the levels, when the plan has draws). */
  knotLandIntercept: Float64Array
  /** Index in `thresholds` of each counted (mean-sea-level) threshold, and its height. */
  thresholdIndex: Int32Array
  heights: Float64Array
  /**
   * Flood levels whose annual chance is wanted for every year (`planOutlook`'s `annualFloodChances`):
   * index in `thresholds`, height, and per level and year (row-major, levels × yearCount) the chance
   * along the all-scores-zero trajectory, the reference of their sums (`SumLayout.floodAnnual`).
   */
  floodIndex: Int32Array
  floodHeights: Float64Array
  floodReference: Float64Array
}

/**
 * Likelihood weighting by an observed record (`observation-plan.ts`). Each trajectory's log-likelihood,
 * less a constant, is a quadratic form in the basis rows x the year counting reads:
 * ℓ(x) = Σ_j linear_j·x_j + Σ_terms coefficient·x_j·x_k. Its weight exp(ℓ − scale) goes into the
 * weighted sums of `OutlookPartial.weighted`, laid out as below.
 */
export interface ObservationPlan {
  count: number
  /** The record's first and last times, its residual model, for the result. */
  firstTime: number
  lastTime: number
  residualSd: number
  phi: number
  /** How far ahead the record is read (`observation-reach.ts`). */
  reach: RecordReachMode
  /** Per basis column: the linear coefficient for the centred basis rows, and for the level rows (plans with draws). */
  linearCentred: Float64Array
  linearLevels: Float64Array
  /** Quadratic terms with a non-zero coefficient: columns j ≥ k and the coefficient of x_j·x_k. */
  termFirst: Int32Array
  termSecond: Int32Array
  termCoefficient: Float64Array
  /**
   * Offsets in `OutlookPartial.weighted`: Σw and Σw² at 0 and 1, then Σw·x_j per basis column and
   * Σw·x_j·x_k (J × J, lower triangle used) at `momentsAt` (each year's weighted mean and sd follow), the
   * weighted exceedance cells at `cellsAt` (as `cellCounts`, samples in histogram cells holding a cut; the
   * others are added from the weighted histogram when finishing), the trigger difference arrays at
   * `triggerAt` (as `triggerCounts`) and the weighted histogram at `histogramAt`.
   */
  momentsAt: number
  cellsAt: number
  triggerAt: number
  histogramAt: number
  size: number
}

/**
 * Everything a sampling thread needs, precomputed from a validated input. Rise tables already carry
 * the component's scale factor and are expressed relative to the outlook's baseline year.
 */
export interface OutlookPlan {
  samples: number
  seed: number
  blockSize: number
  blockCount: number
  baselineYear: number
  years: number[]
  heights: number[]
  componentKeys: string[]
  /** Parts = components then land motion; variance shares are reported per part. */
  partKeys: string[]

  /** Row-major lower-triangular Cholesky factor of the score correlation. */
  cholesky: Float64Array
  choleskyIsIdentity: boolean

  kinds: Int32Array
  /** Per component: first breakpoint in `breakpoints`, and how many. */
  breakpointStart: Int32Array
  breakpointCount: Int32Array
  breakpoints: Float64Array
  /**
   * Each component's rise in year t is Σ_a relativeWeight[t][a] · x_a, with x_a its scaled anchor value for
   * the sample's score. Per component: anchor count, first anchor-value slot, first row of its lines.
   */
  anchorCount: Int32Array
  valueStart: Int32Array
  lineStart: Int32Array
  /** Piecewise and draw forms: x_a = anchorIntercept[row·A + a] + anchorSlope[row·A + a] · score. */
  anchorIntercept: Float64Array
  anchorSlope: Float64Array
  /** Lognormal forms, per anchor-value slot: x = scale · (shift + exp(mu + sigma · score)). */
  lognormalShift: Float64Array
  lognormalMu: Float64Array
  lognormalSigma: Float64Array
  lognormalScale: Float64Array
  /** Anchor-value slots of all components, each slot's basis column, and its value at score zero. */
  valueCount: number
  valueBasis: Int32Array
  valueAtZero: Float64Array
  /**
   * Rise basis: components with the same time weights share columns (one per anchor), land motion's
   * score is the last column. rise(t) = center[t] + Σ_j basisWeight[t·J + j] · (u_j − u_j at score zero),
   * u_j the sum of the slots mapped to column j.
   */
  basisCount: number
  basisWeight: Float64Array

  /**
   * Land motion rise: landIntercept[t] + landSlope[t] · u, u the land-motion column: the score, or for
   * draws the sample's draw less the draw at score zero (mm/yr, see land-motion.ts).
   */
  landIntercept: Float64Array
  landSlope: Float64Array
  /** Land-motion draws (the column value per rank, and how a sample's rank is found), or null. */
  landDraws: LandDrawPlan | null

  /**
   * Per component, the probability levels inside which its values are published (quantile forms: the
   * outermost levels pₖ folded so that both tails count, [max(p₁, 1 − pₘ), min(pₘ, 1 − p₁)]); [0, 1] for
   * other forms, which are never extrapolated. Pairs [low, high].
   */
  publishedLevels: Float64Array
  /** Rise when every score is zero: the reference point of float sums, so they stay well conditioned. */
  center: Float64Array

  /** Sorted distinct exceedance heights: the height grid and the thresholds. */
  cuts: Float64Array
  heightCutIndex: Int32Array
  cutBucketStart: Int32Array
  cutBucketOrigin: number
  cutBucketInverseWidth: number

  /** Percentile histograms: per year [underflow, bins…, overflow] from histogramOffset[t]. */
  histogramResolution: number
  histogramLow: Float64Array
  histogramBins: Int32Array
  histogramOffset: Int32Array
  histogramSize: number

  thresholds: ThresholdPlan[]
  tolerances: number[]

  gumbel: {
    location: number
    scale: number
    returnPeriods: number[]
    /**
     * Heights whose annual chance of being exceeded is summed per year: today's T-year levels, then the flood levels.
     */
    levels: number[]
    /** Per year and level: e^{(center − (level − μ))/λ}, or 0 where the loop uses the direct form (`annualFactor`). */
    levelFactor: Float64Array
    /** Per year and level: the annual chance along the all-scores-zero trajectory, the sums' reference. */
    levelReference: Float64Array
    /** `HeavyTail` of the plan's lognormal components (none: empty arrays, every year settled). */
    heavy: HeavyTail
    /** Parameter uncertainty: each trajectory draws its own location and scale (null: the central pair for all). */
    uncertainty: GumbelUncertainty | null
  } | null
  /** Annual counting for trigger years; null without mean-sea-level thresholds. */
  trigger: TriggerPlan | null
  /** Distinct (start year, design life) pairs of flood levels. */
  lifeSpans: LifeSpan[]
  lifeHistogramSize: number
  /** Sums per block, in this order: see `sumLayout`. */
  sumsPerBlock: number
  sumLayout: SumLayout
  /** Likelihood weighting by an observed record; null without observations (or with an empty record). */
  observations: ObservationPlan | null
}

/**
 * E[e^{rise/λ}] is infinite when the rise has a lognormal part felt with a positive weight (a tail
 * heavier than exponential), so in such years the allowance's sums use the rise with each lognormal
 * anchor value held at its value for score Φ⁻¹(0.999) = 3.0902 when the score is beyond it.
 */
export interface HeavyTail {
  /** Anchor-value slots of lognormal components with sigma > 0 and a non-zero scale. */
  slots: Int32Array
  /** Per heavy slot, its centred value (less `valueAtZero`) at the cap score. */
  cap: Float64Array
  /** Per heavy slot, the sign of its scale: the side its values pass the cap from. */
  sign: Float64Array
  /** Per year and heavy slot (row-major): the weight of the slot's basis column in that year. */
  weight: Float64Array
  /** Per year, 1 where some heavy slot's value is felt with a positive sign (scale · weight > 0). */
  unsettled: Uint8Array
}

/**
 * Per trajectory, location μ + σ_μ·z₁ and scale max(λ + σ_λ·(ρz₁ + √(1−ρ²)·z₂), λ·SCALE_FLOOR), z₁ and z₂
 * two more independent scores drawn after land motion's. Flood chances, expected counts and life chances
 * use the trajectory's pair; the allowance and amplification keep the central λ.
 */
export interface GumbelUncertainty {
  locationSe: number
  scaleSe: number
  correlation: number
  /** Scale never falls below this fraction of the central scale. */
  scaleFloor: number
  /**
   * Per life span, the heights at which its chance of no exceedance is summed (`SumLayout.lifeGrid`):
   * the design-life level is read between them (see `design-life.ts`).
   */
  lifeGrid: Float64Array[]
}

export interface SumLayout {
  /** Per year: Σ(rise − center), Σ(rise − center)². */
  moments: number
  /** Per year and part: Σ(part − part at all scores zero); covariances need no more than the deviation. */
  partSum: number
  /** Per year and part: Σ(part − part at all scores zero)·(rise − center). */
  partCross: number
  /** Per year: Σ exp((rise − center)/λ). */
  gumbelExp: number
  /**
   * Per year and Gumbel level (`gumbel.levels`): Σd and Σd², d a sample's annual chance of exceeding the
   * level less `gumbel.levelReference`'s (about a reference, so a rise without spread gives exactly zero spread).
   */
  annualChance: number
  /**
   * Per threshold with a design life: Σd and Σd², d its chance of no exceedance during the life less `lifeReference`.
   */
  lifeNoExceedance: number
  /**
   * Per year: Σd and Σd², d = exp((rise − center)/λ) − 1 (capped where unsettled, as `gumbelExp`): the allowance's SE.
   */
  gumbelGrowth: number
  /**
   * With parameter uncertainty, per year and Gumbel level: Σ e^{(rise − (level − μ_s))/λ_s}, the expected exceedances.
   */
  expectedCount: number
  /** With parameter uncertainty, per life span and grid height: Σ of each sample's chance of no exceedance. */
  lifeGrid: number
  /**
   * Per `trigger.floodIndex` level and calendar year of the trigger range: Σd and Σd², d a sample's
   * annual chance of exceeding the level less `trigger.floodReference`'s (none unless asked for).
   */
  floodAnnual: number
}

/** Mergeable statistics of some blocks of a plan (consecutive or not). */
export interface OutlookPartial {
  /** The blocks sampled, ascending; `blockSums` follows this order. */
  blocks: Int32Array
  samples: number
  /** Per year, (cuts + 1) cells: how many samples have exactly k cuts strictly below their rise. */
  cellCounts: Uint32Array
  histogram: Uint32Array
  /** Per life span, counts of ln Σ_years e^{rise/λ} (see `LifeSpan`). */
  lifeHistogram: Uint32Array
  /**
   * Per counted threshold m, calendar-year cells [m·(yearCount + 1) …]: a difference array of the
   * samples above the threshold in years strictly between knots (running sums give the counts), plus
   * direct counts at knots that are not output years (see `TriggerPlan`). Adds exactly under merging.
   */
  triggerCounts: Int32Array
  /** Per year, smallest and largest rise seen (exact under any merge order). */
  minimum: Float64Array
  maximum: Float64Array
  /** blocks.length × plan.sumsPerBlock, in the order of `blocks`. */
  blockSums: Float64Array
  /**
   * With observations (`ObservationPlan`), the weighted sums, each weight stored as exp(ℓ − weightScale);
   * weightScale is the largest log-likelihood seen (−∞ before any sample). Merging rescales to the
   * largest scale, so any split adds up to the same sums up to rounding. Empty without observations.
   */
  weighted: Float64Array
  weightScale: number
}

export interface Estimate {
  value: number
  /** Monte Carlo standard error. */
  se: number
  /**
   * Only on a proportion of samples whose count is 0: the one-sided 95 % upper bound min(1, 3/N) (rule
   * of three), so "0 ± 0" can be said as "below 3/N".
   */
  upperBound95?: number
  /** Only on a proportion whose count is N: the one-sided 95 % lower bound max(0, 1 − 3/N). */
  lowerBound95?: number
  /**
   * On every percentile and every mean-sea-level `byYear` chance: true when it rests on a quantile-form
   * release beyond its outermost published levels (rule in the engine README, "Extrapolated"); such a
   * value gets no likelihood word. On the height grid's `exceedance`, present only where true.
   */
  extrapolated?: boolean
}

export interface PercentileEstimate extends Estimate {
  level: number
}

export interface YearOutlook {
  year: number
  mean: Estimate
  sd: number
  percentiles: PercentileEstimate[]
  /** P(rise > height) for each grid height, same order as `heights`. */
  exceedance: Estimate[]
  /** Cov(part, total)/Var(total) by part key; null where the rise has no spread (the baseline year). */
  varianceShare: Record<string, number> | null
  gumbel: YearGumbel | null
}

export interface YearGumbel {
  /** λ·ln mean(exp(rise/λ)), metres. */
  allowance: number
  /** mean(exp(rise/λ)): how many times more often any high level is reached. */
  amplification: number
  /**
   * false where the rise has a lognormal part (a tail heavier than exponential): E[exp(rise/λ)] is then
   * infinite and the two values above are those of the rise with each lognormal part capped at its
   * score-3.0902 (99.9th percentile) value, finite and stable in N but a stated convention.
   */
  settled: boolean
  /** Why not settled (absent when settled). */
  unsettledReason?: 'heavy-tail'
  /**
   * Monte Carlo standard error of `allowance` (delta method: λ·se(mean g)/mean g, g = exp(rise/λ)); 0 with no spread.
   */
  allowanceSe: number
  /** Monte Carlo standard error of `amplification`. */
  amplificationSe: number
  returnPeriods: Array<{
    /** Today's return period T, years. */
    today: number
    /** Today's T-year level, metres above the reference level. */
    level: number
    /** 1 / (mean annual chance of exceeding that level), years. */
    newReturnPeriod: number
    /** Mean over samples of the annual chance; its SE is that of a mean of per-sample chances. */
    annualChance: Estimate
  }>
}

export interface FloodLevelOutlook {
  /** Per output year: chance that year's annual maximum exceeds the height, mean over samples of 1 − F(h − rise). */
  annualChance: Estimate[]
  /**
   * Per output year: expected number of exceedances a year, e^{−(h−μ)/λ} · mean e^{rise/λ} (the Gumbel's Poisson rate).
   */
  expectedPerYear: number[]
  /**
   * Per output year: false where `expectedPerYear` uses the capped rise of an unsettled year (see
   * `YearGumbel.settled`).
   */
  expectedPerYearSettled: boolean[]
  /** Per output year: 1 / annualChance, years; null where the chance is 0. */
  returnPeriodYears: Array<number | null>
}

export interface ThresholdOutlook {
  key: string
  /** Metres above mean sea level at the baseline year. */
  height: number
  kind: ThresholdKind
  designLifeYears: number | null
  lifeStartYear: number | null
  /**
   * mean-sea-level only: P(rise > height) per output year. Empty for a flood level: it is never worded from the
   * mean-sea-level chance.
   */
  byYear: Estimate[]
  /**
   * mean-sea-level only: first calendar year whose P reaches each tolerance (null = not within the horizon); empty for
   * a flood level.
   */
  triggerYears: Array<{
    tolerance: number
    year: number | null
    /**
     * The year rests on the rise's level 1 − tolerance beyond a release's published levels (see
     * `Estimate.extrapolated`).
     */
    extrapolated?: boolean
  }>
  /** flood-level only (null otherwise). */
  flood: FloodLevelOutlook | null
  /** flood-level with a life: chance of at least one exceedance during years lifeStartYear … lifeStartYear+L−1. */
  lifeExceedance: Estimate | null
  /**
   * flood-level with a life: the height (same reference as `height`) with `chance` of at least one exceedance during
   * the life (design-life level, Rootzén & Katz 2013, Water Resources Research).
   */
  designLifeLevel: { chance: number, level: number } | null
}

/** One output year of an observation-updated outlook. */
export interface UpdatedYear {
  year: number
  /**
   * The share of the record's information this year's numbers carry (`RecordReach`): 1 up to the
   * record's last value, 0 once the record is out of reach (the numbers are then the outlook's own).
   */
  carried: number
  /** Weighted mean and sd of the rise; the mean's SE uses the effective sample size. */
  mean: Estimate
  sd: number
  /** Weighted percentiles (levels as `percentileLevels`), SE from the effective sample size. */
  percentiles: PercentileEstimate[]
}

/** A mean-sea-level threshold's updated chances and trigger years (in the order of the result's thresholds). */
export interface UpdatedThreshold {
  key: string
  height: number
  byYear: Estimate[]
  triggerYears: Array<{ tolerance: number, year: number | null }>
}

interface ObservationUpdateBase {
  /** Importance (likelihood) weighting of the trajectories by a Gaussian AR(1) likelihood of the record. */
  method: 'likelihood-weighting'
  observations: number
  firstTime: number
  lastTime: number
  residualSd: number
  phi: number
  /** Kish's effective sample size (Σw)²/Σw², and the least the engine shows updated numbers for. */
  ess: number
  minimumEss: number
  /** How far ahead the record is read (`observation-reach.ts`). */
  reach: RecordReach
}

/**
 * The outlook conditioned on the site's observed record (absent without a record). Refused, with no
 * numbers, when the effective sample size is below `minimumEss`: a handful of trajectories carry all the
 * weight and the updated numbers would be noise.
 */
export type ObservationUpdate
  = | (ObservationUpdateBase & { refused: false, byYear: UpdatedYear[], thresholds: UpdatedThreshold[] })
    | (ObservationUpdateBase & { refused: true, reason: 'too-few-effective-samples' })

export interface OutlookResult {
  samples: number
  seed: number
  blockSize: number
  baselineYear: number
  years: number[]
  heights: number[]
  percentileLevels: number[]
  /** Width of the histogram bins percentiles are read from, metres. */
  percentileResolution: number
  partKeys: string[]
  byYear: YearOutlook[]
  thresholds: ThresholdOutlook[]
  tolerances: number[]
  gumbel: { location: number, scale: number } | null
  /** Present only when the input carried a non-empty observed record. */
  observationUpdate?: ObservationUpdate
}
