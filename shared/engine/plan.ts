import { appendAll, maxOf, minOf } from './arrays'
import { identityFactor } from './correlation'
import { standardNormalQuantile } from './normal'
import { anchorValuesAt, buildComponentTable, componentRiseAt, type ComponentTable } from './releases'
import {
  COMPONENT_KIND_DRAWS,
  COMPONENT_KIND_PIECEWISE,
  LAND_MOTION_KEY,
  type HeavyTail,
  type OutlookPlan,
  type SumLayout,
} from './types'
import { planThresholds } from './threshold-plan'
import { planObservations } from './observation-plan'
import { planTriggers } from './trigger-plan'
import { LIFE_GRID_POINTS, planUncertainty } from './gumbel-uncertainty'
import { landRiseLine, planLandMotion } from './land-motion'
import { validateOutlookInput, type ValidatedOutlookInput } from './validate'

/** Samples per block: the unit of reproducibility (each block has its own random stream). */
export const BLOCK_SIZE = 2048

/** Percentile histograms span each year's rise for every score within ±6; beyond goes to overflow cells. */
const HISTOGRAM_SCORE_SPAN = 6
const HISTOGRAM_RESOLUTIONS = [0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10]
/** The most cells a plan's histogram has (all years); the resolution is coarsened to stay within it. */
export const MAX_HISTOGRAM_CELLS = 1 << 20
const LOGNORMAL_BOUND_POINTS = 241

function componentBounds(table: ComponentTable, yearCount: number): { low: Float64Array, high: Float64Array } {
  const low = new Float64Array(yearCount).fill(Infinity)
  const high = new Float64Array(yearCount).fill(-Infinity)
  const take = (rise: ArrayLike<number>) => {
    for (let t = 0; t < yearCount; t++) {
      if (rise[t]! < low[t]!) low[t] = rise[t]!
      if (rise[t]! > high[t]!) high[t] = rise[t]!
    }
  }
  if (table.kind === COMPONENT_KIND_DRAWS) {
    table.rows.forEach(take)
  }
  else if (table.kind === COMPONENT_KIND_PIECEWISE) {
    // Piecewise-linear in the score: extremes sit at the ends or at a breakpoint.
    for (const z of [-HISTOGRAM_SCORE_SPAN, ...table.breakpoints, HISTOGRAM_SCORE_SPAN])
      take(componentRiseAt(table, z, yearCount))
  }
  else {
    for (let i = 0; i < LOGNORMAL_BOUND_POINTS; i++) {
      const z = -HISTOGRAM_SCORE_SPAN + (2 * HISTOGRAM_SCORE_SPAN * i) / (LOGNORMAL_BOUND_POINTS - 1)
      take(componentRiseAt(table, z, yearCount))
    }
  }
  return { low, high }
}

function bucketIndex(cuts: Float64Array): { start: Int32Array, origin: number, inverseWidth: number } {
  const bucketCount = Math.max(16, 4 * cuts.length)
  const origin = cuts[0]!
  const span = cuts[cuts.length - 1]! - origin
  const width = span > 0 ? span / bucketCount : 1
  const start = new Int32Array(bucketCount)
  let i = 0
  for (let b = 0; b < bucketCount; b++) {
    const edge = origin + b * width
    while (i < cuts.length && cuts[i]! < edge) i++
    start[b] = i
  }
  return { start, origin, inverseWidth: 1 / width }
}

function sameWeights(a: Float64Array[], b: Float64Array[]): boolean {
  if (a.length !== b.length) return false
  for (let t = 0; t < a.length; t++) {
    const rowA = a[t]!
    const rowB = b[t]!
    if (rowA.length !== rowB.length) return false
    for (let k = 0; k < rowA.length; k++) if (rowA[k] !== rowB[k]) return false
  }
  return true
}

/** Score at which lognormal parts are capped in the allowance's sums: Φ⁻¹(0.999). */
export const HEAVY_TAIL_CAP_SCORE = standardNormalQuantile(0.999)

/** The lognormal slots whose tail makes E[e^{rise/λ}] infinite, and where (see `HeavyTail`). */
function heavyTail(
  shift: Float64Array,
  mu: Float64Array,
  sigma: Float64Array,
  scale: Float64Array,
  valueAtZero: Float64Array,
  valueBasis: Int32Array,
  basisWeight: Float64Array,
  basisCount: number,
  yearCount: number,
): HeavyTail {
  const slots: number[] = []
  for (let slot = 0; slot < sigma.length; slot++) if (sigma[slot]! > 0 && scale[slot]! !== 0) slots.push(slot)
  const weight = new Float64Array(yearCount * slots.length)
  const unsettled = new Uint8Array(yearCount)
  slots.forEach((slot, h) => {
    for (let t = 0; t < yearCount; t++) {
      const w = basisWeight[t * basisCount + valueBasis[slot]!]!
      weight[t * slots.length + h] = w
      if (w * scale[slot]! > 0) unsettled[t] = 1
    }
  })
  return {
    slots: Int32Array.from(slots),
    cap: Float64Array.from(
      slots,
      slot =>
        scale[slot]! * (shift[slot]! + Math.exp(mu[slot]! + sigma[slot]! * HEAVY_TAIL_CAP_SCORE)) - valueAtZero[slot]!,
    ),
    sign: Float64Array.from(slots, slot => Math.sign(scale[slot]!)),
    weight,
    unsettled,
  }
}

export interface PlanOptions {
  /**
   * Also sum every flood level's annual chance in every calendar year from the baseline to the last
   * output year (read with `annualFloodChances`), for tipping years at annual resolution. Off for
   * outlooks: it costs a Gumbel chance per sample, year and level.
   */
  annualFloodChances?: boolean
}

/** Validates an outlook request and precomputes everything the sample loop needs. */
export function planOutlook(rawInput: unknown, options: PlanOptions = {}): OutlookPlan {
  const input = validateOutlookInput(rawInput)
  return planValidated(input, options)
}

function planValidated(input: ValidatedOutlookInput, options: PlanOptions): OutlookPlan {
  const years = input.years
  const yearCount = years.length
  const componentCount = input.components.length
  const tables = input.components.map(component =>
    buildComponentTable(component.release, component.scale, input.baselineYear, years),
  )

  const kinds = new Int32Array(componentCount)
  const breakpointStart = new Int32Array(componentCount)
  const breakpointCount = new Int32Array(componentCount)
  const anchorCount = new Int32Array(componentCount)
  const valueStart = new Int32Array(componentCount)
  const lineStart = new Int32Array(componentCount)
  const breakpoints: number[] = []
  const anchorIntercept: number[] = []
  const anchorSlope: number[] = []
  let valueCount = 0
  tables.forEach((table, c) => {
    kinds[c] = table.kind
    breakpointStart[c] = breakpoints.length
    breakpointCount[c] = table.breakpoints.length
    appendAll(breakpoints, table.breakpoints)
    anchorCount[c] = table.relativeWeights[0]?.length ?? 0
    valueStart[c] = valueCount
    valueCount += anchorCount[c]!
    lineStart[c] = anchorIntercept.length
    appendAll(anchorIntercept, table.anchorIntercept)
    appendAll(anchorSlope, table.anchorSlope)
  })

  const lognormalShift = new Float64Array(valueCount)
  const lognormalMu = new Float64Array(valueCount)
  const lognormalSigma = new Float64Array(valueCount)
  const lognormalScale = new Float64Array(valueCount)
  const valueAtZero = new Float64Array(valueCount)
  const valueBasis = new Int32Array(valueCount)
  // Components whose time weights are identical (same release baseline and anchor years) share basis
  // columns, so a sample's rise in every year comes from a handful of per-anchor sums.
  const groupWeights: Float64Array[][] = []
  const groupFirstColumn: number[] = []
  const groupRelease: Array<{ baselineYear: number, anchorYears: number[] }> = []
  let basisCount = 0
  tables.forEach((table, c) => {
    const anchors = anchorCount[c]!
    // Compared number by number: turning the weights into a string key cost a sixth of the plan.
    const group = groupWeights.findIndex(weights => sameWeights(weights, table.relativeWeights))
    let first = groupFirstColumn[group]
    if (first === undefined) {
      first = basisCount
      groupWeights.push(table.relativeWeights)
      groupFirstColumn.push(first)
      groupRelease.push(input.components[c]!.release)
      basisCount += anchors
    }
    valueAtZero.set(anchorValuesAt(table, 0, anchors), valueStart[c]!)
    for (let a = 0; a < anchors; a++) {
      const slot = valueStart[c]! + a
      valueBasis[slot] = first + a
      if (table.lognormal) {
        lognormalShift[slot] = table.lognormal.shift[a]!
        lognormalMu[slot] = table.lognormal.mu[a]!
        lognormalSigma[slot] = table.lognormal.sigma[a]!
        lognormalScale[slot] = table.scale
      }
    }
  })
  const landColumn = basisCount++

  // Land motion enters relative to the outlook baseline, like every component: −(rate + σz)/1000 ·
  // (t − baseline), or −(draw at score zero + u)/1000 · (t − baseline) for draws (see land-motion.ts).
  // The epoch of the rate cancels for a constant rate, so it is kept for provenance only.
  const land = planLandMotion(input.landMotion, input.components.map(component => component.key), tables)
  const landIntercept = new Float64Array(yearCount)
  const landSlope = new Float64Array(yearCount)
  if (input.landMotion) {
    for (let t = 0; t < yearCount; t++) {
      const rise = landRiseLine(land.line, years[t]! - input.baselineYear)
      landIntercept[t] = rise.intercept
      landSlope[t] = rise.slope
    }
  }

  const basisWeight = new Float64Array(yearCount * basisCount)
  let column = 0
  for (const weights of groupWeights) {
    for (let t = 0; t < yearCount; t++) basisWeight.set(weights[t]!, t * basisCount + column)
    column += weights[0]?.length ?? 0
  }
  for (let t = 0; t < yearCount; t++) basisWeight[t * basisCount + landColumn] = landSlope[t]!

  // The all-scores-zero trajectory, formed the way the sample loop forms a rise.
  const center = Float64Array.from(landIntercept)
  for (let t = 0; t < yearCount; t++) {
    for (let slot = 0; slot < valueCount; slot++)
      center[t]! += basisWeight[t * basisCount + valueBasis[slot]!]! * valueAtZero[slot]!
  }
  const low = new Float64Array(yearCount)
  const high = new Float64Array(yearCount)
  // Land draws are bounded: their column spans the lowest to the highest draw, not ±6 scores.
  const landValues = land.draws?.valueByRank
  const landLow = landValues ? minOf(landValues) : -HISTOGRAM_SCORE_SPAN
  const landHigh = landValues ? maxOf(landValues) : HISTOGRAM_SCORE_SPAN
  for (let t = 0; t < yearCount; t++) {
    if (landValues) {
      low[t] = landIntercept[t]! + Math.min(landSlope[t]! * landLow, landSlope[t]! * landHigh)
      high[t] = landIntercept[t]! + Math.max(landSlope[t]! * landLow, landSlope[t]! * landHigh)
      continue
    }
    low[t] = landIntercept[t]! - HISTOGRAM_SCORE_SPAN * Math.abs(landSlope[t]!)
    high[t] = landIntercept[t]! + HISTOGRAM_SCORE_SPAN * Math.abs(landSlope[t]!)
  }
  for (const table of tables) {
    const bounds = componentBounds(table, yearCount)
    for (let t = 0; t < yearCount; t++) {
      low[t]! += bounds.low[t]!
      high[t]! += bounds.high[t]!
    }
  }

  let resolution = HISTOGRAM_RESOLUTIONS[HISTOGRAM_RESOLUTIONS.length - 1]!
  for (const candidate of HISTOGRAM_RESOLUTIONS) {
    let cells = 0
    for (let t = 0; t < yearCount; t++) cells += Math.ceil((high[t]! - low[t]!) / candidate) + 3
    if (cells <= MAX_HISTOGRAM_CELLS) {
      resolution = candidate
      break
    }
  }
  const histogramBins = new Int32Array(yearCount)
  const histogramOffset = new Int32Array(yearCount)
  let histogramSize = 0
  for (let t = 0; t < yearCount; t++) {
    histogramBins[t] = Math.ceil((high[t]! - low[t]!) / resolution) + 1
    histogramOffset[t] = histogramSize
    histogramSize += histogramBins[t]! + 2
  }

  // Flood levels are compared with the total water level, never counted against the rise.
  const riseHeights = input.thresholds
    .filter(threshold => threshold.kind === 'mean-sea-level')
    .map(threshold => threshold.height)
  const cuts = Float64Array.from(new Set([...input.heights, ...riseHeights])).sort()
  const cutPosition = (height: number) => cuts.indexOf(height)
  const buckets = bucketIndex(cuts)
  const {
    thresholds,
    lifeSpans,
    lifeHistogramSize,
    gumbel: planned,
  } = planThresholds(input, cutPosition, center, low, high)
  const gumbel = planned && {
    ...planned,
    heavy: heavyTail(
      lognormalShift,
      lognormalMu,
      lognormalSigma,
      lognormalScale,
      valueAtZero,
      valueBasis,
      basisWeight,
      basisCount,
      yearCount,
    ),
    uncertainty: input.gumbel ? planUncertainty(input.gumbel, lifeSpans) : null,
  }

  const counted = thresholds.flatMap((threshold, k) => (threshold.cutIndex === null ? [] : [k]))
  const annualFloods = options.annualFloodChances && gumbel
    ? thresholds.flatMap((threshold, k) => (threshold.levelIndex === null ? [] : [k]))
    : []
  const trigger = planTriggers(
    input,
    land.line,
    groupRelease.map((release, g) => ({ firstColumn: groupFirstColumn[g]!, release })),
    basisCount,
    valueBasis,
    valueAtZero,
    counted,
    counted.map(k => thresholds[k]!.height),
    annualFloods.map(k => ({ index: k, height: thresholds[k]!.height })),
  )

  const observations = planObservations(
    input,
    land.line,
    groupRelease.map((release, g) => ({ firstColumn: groupFirstColumn[g]!, release })),
    basisCount,
    valueBasis,
    valueAtZero,
    { years: yearCount, cuts: cuts.length, histogramSize, trigger },
  )

  const partCount = componentCount + 1
  const levelCount = gumbel ? gumbel.levels.length : 0
  const gumbelExp = 2 * yearCount + 2 * partCount * yearCount
  const annualChance = gumbelExp + (gumbel ? yearCount : 0)
  const sumLayout: SumLayout = {
    moments: 0,
    partSum: 2 * yearCount,
    partCross: 2 * yearCount + partCount * yearCount,
    gumbelExp,
    annualChance,
    lifeNoExceedance: annualChance + 2 * levelCount * yearCount,
    gumbelGrowth: 0,
    expectedCount: 0,
    lifeGrid: 0,
    floodAnnual: 0,
  }
  const lifeThresholds = thresholds.filter(threshold => threshold.lifeSumIndex !== null).length
  sumLayout.gumbelGrowth = sumLayout.lifeNoExceedance + 2 * lifeThresholds
  sumLayout.expectedCount = sumLayout.gumbelGrowth + (gumbel ? 2 * yearCount : 0)
  const uncertain = gumbel?.uncertainty ?? null
  sumLayout.lifeGrid = sumLayout.expectedCount + (uncertain ? levelCount * yearCount : 0)
  sumLayout.floodAnnual = sumLayout.lifeGrid + (uncertain ? uncertain.lifeGrid.length * LIFE_GRID_POINTS : 0)
  const sumsPerBlock = sumLayout.floodAnnual + (trigger ? 2 * trigger.floodReference.length : 0)

  const factor = input.choleskyFactor ?? identityFactor(componentCount)
  const identity = identityFactor(componentCount)
  const componentKeys = input.components.map(component => component.key)

  return {
    samples: input.samples,
    seed: input.seed,
    blockSize: BLOCK_SIZE,
    blockCount: Math.ceil(input.samples / BLOCK_SIZE),
    baselineYear: input.baselineYear,
    years: [...years],
    heights: [...input.heights],
    componentKeys,
    partKeys: [...componentKeys, LAND_MOTION_KEY],
    cholesky: factor,
    choleskyIsIdentity: factor.every((value, i) => value === identity[i]),
    kinds,
    breakpointStart,
    breakpointCount,
    breakpoints: Float64Array.from(breakpoints),
    anchorCount,
    valueStart,
    lineStart,
    anchorIntercept: Float64Array.from(anchorIntercept),
    anchorSlope: Float64Array.from(anchorSlope),
    lognormalShift,
    lognormalMu,
    lognormalSigma,
    lognormalScale,
    valueCount,
    valueBasis,
    valueAtZero,
    basisCount,
    basisWeight,
    landIntercept,
    landSlope,
    landDraws: land.draws,
    publishedLevels: Float64Array.from(
      input.components.flatMap(({ release }) => {
        if (release.form !== 'quantiles') return [0, 1]
        const first = release.levels[0]!
        const last = release.levels[release.levels.length - 1]!
        return [Math.max(first, 1 - last), Math.min(last, 1 - first)]
      }),
    ),
    center,
    cuts,
    heightCutIndex: Int32Array.from(input.heights, cutPosition),
    cutBucketStart: buckets.start,
    cutBucketOrigin: buckets.origin,
    cutBucketInverseWidth: buckets.inverseWidth,
    histogramResolution: resolution,
    histogramLow: low,
    histogramBins,
    histogramOffset,
    histogramSize,
    thresholds,
    tolerances: [...input.tolerances],
    gumbel,
    trigger,
    lifeSpans,
    lifeHistogramSize,
    sumsPerBlock,
    sumLayout,
    observations,
  }
}
