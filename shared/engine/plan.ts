import { identityFactor } from './correlation'
import { buildComponentTable, componentRiseAt, type ComponentTable } from './releases'
import {
  COMPONENT_KIND_DRAWS,
  COMPONENT_KIND_PIECEWISE,
  LAND_MOTION_KEY,
  type OutlookPlan,
  type SumLayout,
  type ThresholdPlan,
} from './types'
import { validateOutlookInput, type ValidatedOutlookInput } from './validate'

/** Samples per block: the unit of reproducibility (each block has its own random stream). */
export const BLOCK_SIZE = 8192

/** Percentile histograms span each year's rise for every score within ±6; beyond goes to overflow cells. */
const HISTOGRAM_SCORE_SPAN = 6
const HISTOGRAM_RESOLUTIONS = [0.001, 0.002, 0.005, 0.01, 0.02, 0.05, 0.1, 0.2, 0.5, 1, 2, 5, 10]
const MAX_HISTOGRAM_CELLS = 1 << 20
const LOGNORMAL_BOUND_POINTS = 241

function componentBounds(table: ComponentTable, yearCount: number): { low: Float64Array; high: Float64Array } {
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
  } else if (table.kind === COMPONENT_KIND_PIECEWISE) {
    // Piecewise-linear in the score: extremes sit at the ends or at a breakpoint.
    for (const z of [-HISTOGRAM_SCORE_SPAN, ...table.breakpoints, HISTOGRAM_SCORE_SPAN]) take(componentRiseAt(table, z, yearCount))
  } else {
    for (let i = 0; i < LOGNORMAL_BOUND_POINTS; i++) {
      const z = -HISTOGRAM_SCORE_SPAN + (2 * HISTOGRAM_SCORE_SPAN * i) / (LOGNORMAL_BOUND_POINTS - 1)
      take(componentRiseAt(table, z, yearCount))
    }
  }
  return { low, high }
}

function bucketIndex(cuts: Float64Array): { start: Int32Array; origin: number; inverseWidth: number } {
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

/** Validates an outlook request and precomputes everything the sample loop needs. */
export function planOutlook(rawInput: unknown): OutlookPlan {
  const input = validateOutlookInput(rawInput)
  return planValidated(input)
}

function planValidated(input: ValidatedOutlookInput): OutlookPlan {
  const years = input.years
  const yearCount = years.length
  const componentCount = input.components.length
  const tables = input.components.map((component) =>
    buildComponentTable(component.release, component.scale, input.baselineYear, years),
  )

  const kinds = new Int32Array(componentCount)
  const breakpointStart = new Int32Array(componentCount)
  const breakpointCount = new Int32Array(componentCount)
  const rowStart = new Int32Array(componentCount)
  const anchorCount = new Int32Array(componentCount)
  const breakpoints: number[] = []
  const pieceRows: Float64Array[] = []
  const pieceSlopes: Float64Array[] = []
  const drawRows: Float64Array[] = []
  const shift: number[] = []
  const mu: number[] = []
  const sigma: number[] = []
  const anchorWeightRows: Float64Array[] = []
  tables.forEach((table, c) => {
    kinds[c] = table.kind
    breakpointStart[c] = breakpoints.length
    breakpointCount[c] = table.breakpoints.length
    breakpoints.push(...table.breakpoints)
    if (table.kind === COMPONENT_KIND_PIECEWISE) {
      rowStart[c] = pieceRows.length
      pieceRows.push(...table.rows)
      pieceSlopes.push(...table.slopes)
    } else if (table.kind === COMPONENT_KIND_DRAWS) {
      rowStart[c] = drawRows.length
      drawRows.push(...table.rows)
    } else {
      const lognormal = table.lognormal!
      rowStart[c] = shift.length
      anchorCount[c] = lognormal.shift.length
      shift.push(...lognormal.shift)
      mu.push(...lognormal.mu)
      sigma.push(...lognormal.sigma)
      // Stored anchor-major so the sample loop reads one contiguous row per anchor.
      for (let a = 0; a < lognormal.shift.length; a++) {
        anchorWeightRows.push(Float64Array.from(lognormal.weights, (row) => row[a]!))
      }
    }
  })
  const flatten = (rows: Float64Array[]) => {
    const flat = new Float64Array(rows.length * yearCount)
    rows.forEach((row, i) => flat.set(row, i * yearCount))
    return flat
  }

  // Land motion enters relative to the outlook baseline, like every component: −(rate + σz)/1000 ·
  // (t − baseline). The epoch of the rate cancels for a constant rate, so it is kept for provenance only.
  const landIntercept = new Float64Array(yearCount)
  const landSlope = new Float64Array(yearCount)
  if (input.landMotion) {
    for (let t = 0; t < yearCount; t++) {
      const elapsed = years[t]! - input.baselineYear
      landIntercept[t] = (-input.landMotion.rateMmPerYear / 1000) * elapsed
      landSlope[t] = (-input.landMotion.sigmaMmPerYear / 1000) * elapsed
    }
  }

  const center = Float64Array.from(landIntercept)
  const low = new Float64Array(yearCount)
  const high = new Float64Array(yearCount)
  for (let t = 0; t < yearCount; t++) {
    low[t] = landIntercept[t]! - HISTOGRAM_SCORE_SPAN * Math.abs(landSlope[t]!)
    high[t] = landIntercept[t]! + HISTOGRAM_SCORE_SPAN * Math.abs(landSlope[t]!)
  }
  for (const table of tables) {
    const atZero = componentRiseAt(table, 0, yearCount)
    const bounds = componentBounds(table, yearCount)
    for (let t = 0; t < yearCount; t++) {
      center[t]! += atZero[t]!
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

  const cuts = Float64Array.from(new Set([...input.heights, ...input.thresholds.map((threshold) => threshold.height)])).sort()
  const cutPosition = (height: number) => cuts.indexOf(height)
  const buckets = bucketIndex(cuts)

  const lifeSpans: number[] = []
  let lifeSums = 0
  const thresholds: ThresholdPlan[] = input.thresholds.map((threshold, i) => {
    const life = threshold.designLifeYears ?? null
    let lifeSpanIndex: number | null = null
    if (life !== null && input.gumbel) {
      lifeSpanIndex = lifeSpans.indexOf(life)
      if (lifeSpanIndex < 0) lifeSpanIndex = lifeSpans.push(life) - 1
    }
    return {
      key: threshold.key ?? `threshold-${i + 1}`,
      height: threshold.height,
      designLifeYears: life,
      cutIndex: cutPosition(threshold.height),
      lifeSpanIndex,
      lifeSumIndex: lifeSpanIndex === null ? null : lifeSums++,
    }
  })

  const partCount = componentCount + 1
  const returnPeriods = input.gumbel ? input.gumbel.returnPeriods : []
  const sumLayout: SumLayout = {
    moments: 0,
    partSum: 2 * yearCount,
    partCross: 2 * yearCount + partCount * yearCount,
    gumbelExp: 2 * yearCount + 2 * partCount * yearCount,
    returnChance: 2 * yearCount + 2 * partCount * yearCount + (input.gumbel ? yearCount : 0),
    lifeNoExceedance: 2 * yearCount + 2 * partCount * yearCount + (input.gumbel ? yearCount : 0) + returnPeriods.length * yearCount,
  }
  const sumsPerBlock = sumLayout.lifeNoExceedance + lifeSums

  const factor = input.choleskyFactor ?? identityFactor(componentCount)
  const identity = identityFactor(componentCount)
  const componentKeys = input.components.map((component) => component.key)

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
    rowStart,
    pieceIntercept: flatten(pieceRows),
    pieceSlope: flatten(pieceSlopes),
    drawRise: flatten(drawRows),
    anchorCount,
    lognormalShift: Float64Array.from(shift),
    lognormalMu: Float64Array.from(mu),
    lognormalSigma: Float64Array.from(sigma),
    anchorWeight: flatten(anchorWeightRows),
    landIntercept,
    landSlope,
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
    gumbel: input.gumbel
      ? { location: input.gumbel.location, scale: input.gumbel.scale, returnPeriods: [...input.gumbel.returnPeriods] }
      : null,
    lifeSpans,
    sumsPerBlock,
    sumLayout,
  }
}

