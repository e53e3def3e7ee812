import { HOLDS_CUT, PASS, type SamplerTables } from './sampler-tables'
import { ROW, TILE, type TileScratch } from './tile-scratch'
import type { OutlookPartial, OutlookPlan } from './types'
import { MAX_HISTOGRAM_CELLS } from './plan'

// Each year's rise, placed in the percentile histogram and among the exceedance heights.

/**
 * The histogram cell of each sample of the tile, for one year at a time. A module array rather than a
 * field of the scratch: passed to `countOnePass` as one more argument, it made that loop 8 % slower.
 */
const CELLS = new Int32Array(TILE)

/**
 * The weighted histogram of an observation-updated run while it is counted, cell for cell as the plan's
 * histogram; `finishWeightedCells` adds it to the partial. A module constant rather than the partial's
 * sums at an offset: the hot loop then reads neither the array nor the offset, which took a fifth off
 * weighting's own time on W1. Sized for the largest histogram a plan may have; only the pages a run
 * touches are ever resident.
 */
const WEIGHTED_CELLS = new Float64Array(MAX_HISTOGRAM_CELLS)

/** Clears the weighted histogram for a run of `plan`. */
export function startWeightedCells(plan: OutlookPlan): void {
  if (plan.histogramSize > WEIGHTED_CELLS.length)
    throw new RangeError(`a histogram of ${plan.histogramSize} cells is more than the ${WEIGHTED_CELLS.length} planned for`)
  WEIGHTED_CELLS.fill(0, 0, plan.histogramSize)
}

/** Multiplies the run's weighted histogram by `factor`, as `rescaleWeighted` does the partial's sums. */
export function rescaleWeightedCells(plan: OutlookPlan, factor: number): void {
  for (let k = 0; k < plan.histogramSize; k++) WEIGHTED_CELLS[k] = WEIGHTED_CELLS[k]! * factor
}

/**
 * Adds the run's weighted histogram to the partial's (at `histogramAt`). Each cell is written by one
 * kind of year only (listed cells here, others by `addWeightedTile` and `countConstantYear` in the
 * partial), so every sum is the same bits as if it had been added there directly.
 */
export function finishWeightedCells(plan: OutlookPlan, partial: OutlookPartial): void {
  const at = plan.observations!.histogramAt
  for (let k = 0; k < plan.histogramSize; k++) partial.weighted[at + k]! += WEIGHTED_CELLS[k]!
}

/**
 * A year's rise is intercept + Σ_j weight_j · row_j over the level rows (the land-motion intercept), or
 * over the centred basis when the value loop summed that (the all-scores-zero rise, which adds each
 * column's value at zero back).
 */
function riseIntercept(plan: OutlookPlan, scratch: TileScratch, t: number): number {
  return scratch.sumsAreLevels ? plan.landIntercept[t]! : plan.center[t]!
}

/**
 * rise(t) = intercept + Σ_j weight_j · level_j over the tile, a few columns per pass: every pass but the
 * last, which `countYear` adds as it reads the rise.
 */
export function riseOfYear(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  t: number,
  tileCount: number,
): void {
  const rise = scratch.rise
  const levels = scratch.rows
  const levelsAt = scratch.sumsAreLevels ? scratch.levelsAt : scratch.basisAt
  const columns = tables.yearColumns[t]!
  const weights = tables.yearWeights[t]!
  const out = t * ROW
  if (columns.length === PASS) return
  rise.fill(riseIntercept(plan, scratch, t), out, out + tileCount)
  for (let p = 0; p + PASS < columns.length; p += PASS) {
    const b0 = levelsAt + columns[p]! * ROW
    const b1 = levelsAt + columns[p + 1]! * ROW
    const b2 = levelsAt + columns[p + 2]! * ROW
    const b3 = levelsAt + columns[p + 3]! * ROW
    const w0 = weights[p]!
    const w1 = weights[p + 1]!
    const w2 = weights[p + 2]!
    const w3 = weights[p + 3]!
    for (let i = 0; i < tileCount; i++) {
      rise[out + i]
        = rise[out + i]! + w0 * levels[b0 + i]! + w1 * levels[b1 + i]! + w2 * levels[b2 + i]! + w3 * levels[b3 + i]!
    }
  }
}

/**
 * What counting year t reads: its histogram's place and bounds, and where the last pass of its rise reads
 * its columns, with their weights (padding weighs zero).
 */
interface YearCounting {
  low: number
  lastBin: number
  histogramAt: number
  riseAt: number
  b0: number
  b1: number
  b2: number
  b3: number
  w0: number
  w1: number
  w2: number
  w3: number
  /** One pass (the usual case) starts from the intercept; more start from `riseOfYear`'s sums. */
  onePass: boolean
  intercept: number
  /** Columns of the pass that carry a weight: most years need two or three. */
  used: number
}

function yearCounting(plan: OutlookPlan, tables: SamplerTables, scratch: TileScratch, t: number): YearCounting {
  const levelsAt = scratch.sumsAreLevels ? scratch.levelsAt : scratch.basisAt
  const columns = tables.yearColumns[t]!
  const weights = tables.yearWeights[t]!
  const last = columns.length - PASS
  const w2 = weights[last + 2]!
  const w3 = weights[last + 3]!
  return {
    low: plan.histogramLow[t]!,
    lastBin: plan.histogramBins[t]! + 1,
    histogramAt: plan.histogramOffset[t]!,
    riseAt: t * ROW,
    b0: levelsAt + columns[last]! * ROW,
    b1: levelsAt + columns[last + 1]! * ROW,
    b2: levelsAt + columns[last + 2]! * ROW,
    b3: levelsAt + columns[last + 3]! * ROW,
    w0: weights[last]!,
    w1: weights[last + 1]!,
    w2,
    w3,
    onePass: last === 0,
    intercept: riseIntercept(plan, scratch, t),
    used: w3 !== 0 ? 4 : w2 !== 0 ? 3 : 2,
  }
}

/** Histogram, extremes, and the exceedance cell of samples in histogram cells that hold a cut, for year t. */
export function countYear(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  t: number,
  tileCount: number,
  partial: OutlookPartial,
): void {
  const rise = scratch.rise
  const inverseResolution = 1 / plan.histogramResolution
  const histogram = scratch.histogram
  const levels = scratch.rows
  const {
    low, lastBin, histogramAt, riseAt, b0, b1, b2, b3, w0, w1, w2, w3, onePass, intercept, used,
  } = yearCounting(plan, tables, scratch, t)
  // The Gumbel statistics read each year's rise back.
  const keepRise = plan.gumbel !== null
  let minimum = partial.minimum[t]!
  let maximum = partial.maximum[t]!
  // Samples in a histogram cell holding a cut (its working count is negative) are listed without a
  // branch and placed exactly after the loop.
  const listed = scratch.listed
  let listedCount = 0
  if (onePass && !keepRise && used < 4) {
    countOnePass(
      levels,
      histogramAt,
      b0,
      b1,
      b2,
      w0,
      w1,
      w2,
      used === 3,
      intercept,
      low,
      inverseResolution,
      lastBin,
      tileCount,
      partial.minimum,
      partial.maximum,
      t,
    )
    minimum = partial.minimum[t]!
    maximum = partial.maximum[t]!
    listedCount = addCells(scratch, CELLS, tileCount)
  }
  else for (let i = 0; i < tileCount; i++) {
    let value = (onePass ? intercept : rise[riseAt + i]!) + w0 * levels[b0 + i]! + w1 * levels[b1 + i]!
    if (used > 2) value += w2 * levels[b2 + i]!
    if (used > 3) value += w3 * levels[b3 + i]!
    if (keepRise) rise[riseAt + i] = value
    if (value < minimum) minimum = value
    if (value > maximum) maximum = value
    let bin = (value - low) * inverseResolution + 1
    bin = bin < 0 ? 0 : bin > lastBin ? lastBin : bin | 0
    const at = histogramAt + bin
    const count = histogram[at]! + 1
    histogram[at] = count
    if (count < 0) listed[listedCount++] = i
  }
  partial.minimum[t] = minimum
  partial.maximum[t] = maximum
  placeListed(plan, tables, scratch, t, listed, listedCount, partial)
}

/**
 * The exceedance cells of year t's listed samples (those in histogram cells holding a cut), each value
 * formed again with the same arithmetic as when it was counted, so it is the same value (a kept rise is
 * already the value).
 */
export function placeListed(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  t: number,
  listed: Int32Array,
  listedCount: number,
  partial: OutlookPartial,
): void {
  const rise = scratch.rise
  const cellOfBin = tables.cellOfBin
  const cuts = plan.cuts
  const cutCount = cuts.length
  const inverseResolution = 1 / plan.histogramResolution
  const cellCounts = partial.cellCounts
  const cellAt = t * (cutCount + 1)
  const levels = scratch.rows
  const { low, lastBin, histogramAt, riseAt, b0, b1, b2, b3, w0, w1, w2, w3, onePass, intercept, used } = yearCounting(
    plan,
    tables,
    scratch,
    t,
  )
  const keepRise = plan.gumbel !== null
  const weights = scratch.weights
  const weighted = scratch.weighted
  const weightedCellAt = scratch.weightedCellsAt + cellAt
  for (let k = 0; k < listedCount; k++) {
    const i = listed[k]!
    let value = keepRise
      ? rise[riseAt + i]!
      : (onePass ? intercept : rise[riseAt + i]!) + w0 * levels[b0 + i]! + w1 * levels[b1 + i]!
    if (!keepRise && used > 2) value += w2 * levels[b2 + i]!
    if (!keepRise && used > 3) value += w3 * levels[b3 + i]!
    let bin = (value - low) * inverseResolution + 1
    bin = bin < 0 ? 0 : bin > lastBin ? lastBin : bin | 0
    let cell = -1 - cellOfBin[histogramAt + bin]!
    while (cell < cutCount && cuts[cell]! < value) cell++
    cellCounts[cellAt + cell]!++
    if (weights !== null) weighted[weightedCellAt + cell]! += weights[i]!
  }
}

/**
 * Whether year t's samples get their histogram cells listed by the counting kernels (`countOnePass`
 * and the pairs), the constant year included: their weights are added from those cells. Other years'
 * weighted counts form the rise again (`addWeightedTile`).
 */
export function countedByCells(plan: OutlookPlan, tables: SamplerTables, t: number): boolean {
  if (tables.constantYear[t] || tables.pairedYear[t]) return true
  return tables.yearColumns[t]!.length === PASS && plan.gumbel === null && tables.yearWeights[t]![3] === 0
}

/**
 * Adds each tile sample to its histogram cell (`cells`, as `countOnePass` and the pairs list them) and,
 * for an observation-updated outlook, its weight beside it; lists the samples whose cell holds a cut and
 * returns how many.
 */
export function addCells(scratch: TileScratch, cells: Int32Array, tileCount: number): number {
  if (scratch.weights === null) return addToHistogram(scratch.histogram, cells, scratch.listed, tileCount)
  return addToHistogramWeighted(scratch.histogram, cells, scratch.listed, tileCount, scratch.weights)
}

/**
 * `countYear`'s loop for the usual year: one pass of two or three columns and no rise kept. The
 * optimizing compiler neither hoists loop-invariant tests nor drops overflow checks on index sums, so
 * this copy has no such tests inside (one loop per column count) and its index sums are `| 0`. Same
 * arithmetic, in the same order, as the general loop. Leaves each sample's histogram cell in CELLS.
 */
function countOnePass(
  levels: Float64Array,
  histogramAt: number,
  b0: number,
  b1: number,
  b2: number,
  w0: number,
  w1: number,
  w2: number,
  threeColumns: boolean,
  intercept: number,
  low: number,
  inverseResolution: number,
  lastBin: number,
  tileCount: number,
  minima: Float64Array,
  maxima: Float64Array,
  t: number,
): void {
  let minimum = minima[t]!
  let maximum = maxima[t]!
  const cells = CELLS
  if (threeColumns) {
    for (let i = 0; i < tileCount; i = (i + 1) | 0) {
      const value = intercept + w0 * levels[(b0 + i) | 0]! + w1 * levels[(b1 + i) | 0]! + w2 * levels[(b2 + i) | 0]!
      if (value < minimum) minimum = value
      if (value > maximum) maximum = value
      let bin = (value - low) * inverseResolution + 1
      bin = bin < 0 ? 0 : bin > lastBin ? lastBin : bin | 0
      cells[i] = (histogramAt + bin) | 0
    }
  }
  else {
    for (let i = 0; i < tileCount; i = (i + 1) | 0) {
      const value = intercept + w0 * levels[(b0 + i) | 0]! + w1 * levels[(b1 + i) | 0]!
      if (value < minimum) minimum = value
      if (value > maximum) maximum = value
      let bin = (value - low) * inverseResolution + 1
      bin = bin < 0 ? 0 : bin > lastBin ? lastBin : bin | 0
      cells[i] = (histogramAt + bin) | 0
    }
  }
  minima[t] = minimum
  maxima[t] = maximum
}

/**
 * Adds each sample to its histogram cell and lists the samples whose cell holds a cut; returns how many.
 * A loop of its own: each cell index is ready long before its turn, so the processor runs the loads and
 * stores of many samples ahead instead of waiting on the arithmetic that found them.
 */
function addToHistogram(
  histogram: Int32Array,
  cells: Int32Array,
  listed: Int32Array,
  tileCount: number,
): number {
  let listedCount = 0
  for (let i = 0; i < tileCount; i = (i + 1) | 0) {
    const at = cells[i]!
    const count = (histogram[at]! + 1) | 0
    histogram[at] = count
    if (count < 0) {
      listed[listedCount] = i
      listedCount = (listedCount + 1) | 0
    }
  }
  return listedCount
}

/**
 * A year whose weights are all zero (the baseline year): every sample's rise is the land-motion
 * intercept, so the tile is counted at once.
 */
export function countConstantYear(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  t: number,
  tileCount: number,
  partial: OutlookPartial,
): void {
  const value = plan.landIntercept[t]!
  const lastBin = plan.histogramBins[t]! + 1
  let bin = (value - plan.histogramLow[t]!) * (1 / plan.histogramResolution) + 1
  bin = bin < 0 ? 0 : bin > lastBin ? lastBin : bin | 0
  const at = plan.histogramOffset[t]! + bin
  scratch.histogram[at]! += tileCount
  const weights = scratch.weights
  let weight = 0
  if (weights !== null) {
    for (let i = 0; i < tileCount; i++) weight += weights[i]!
    scratch.weighted[scratch.weightedHistogramAt + at]! += weight
  }
  const cellHint = tables.cellOfBin[at]!
  if (cellHint < 0) {
    let cell = -1 - cellHint
    while (cell < plan.cuts.length && plan.cuts[cell]! < value) cell++
    partial.cellCounts[t * (plan.cuts.length + 1) + cell]! += tileCount
    if (weights !== null) scratch.weighted[scratch.weightedCellsAt + t * (plan.cuts.length + 1) + cell]! += weight
  }
  if (value < partial.minimum[t]!) partial.minimum[t] = value
  if (value > partial.maximum[t]!) partial.maximum[t] = value
  if (plan.gumbel !== null) scratch.rise.fill(value, t * ROW, t * ROW + tileCount)
}

/**
 * The partial's histogram from the working counts (sign bits cleared), and the samples of histogram
 * cells without a cut added to their exceedance cells.
 */
export function finishCounts(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  partial: OutlookPartial,
): void {
  const cellsPerYear = plan.cuts.length + 1
  const cellOfBin = tables.cellOfBin
  const working = scratch.histogram
  const histogram = partial.histogram
  const cellCounts = partial.cellCounts
  const notHoldsCut = ~HOLDS_CUT
  // Most cells are empty (the histogram spans every score within ±6): they are skipped, the partial's
  // histogram being new and zero. This loop runs once per call on every pooled request's critical path.
  for (let t = 0; t < plan.years.length; t++) {
    const at = plan.histogramOffset[t]!
    const end = at + plan.histogramBins[t]! + 1
    const cellAt = t * cellsPerYear
    for (let bin = at; bin <= end; bin++) {
      const count = working[bin]! & notHoldsCut
      if (count === 0) continue
      histogram[bin] = count
      const cell = cellOfBin[bin]!
      if (cell >= 0) cellCounts[cellAt + cell]! += count
    }
  }
}

/**
 * `addToHistogram` with each sample's weight added to its cell of the weighted histogram
 * (`WEIGHTED_CELLS`) in the same loop: the cell index is read once for both, and each sum still adds its
 * samples in order.
 */
function addToHistogramWeighted(
  histogram: Int32Array,
  cells: Int32Array,
  listed: Int32Array,
  tileCount: number,
  weights: Float64Array,
): number {
  const weighted = WEIGHTED_CELLS
  let listedCount = 0
  for (let i = 0; i < tileCount; i = (i + 1) | 0) {
    const at = cells[i]!
    const count = (histogram[at]! + 1) | 0
    histogram[at] = count
    weighted[at]! += weights[i]!
    if (count < 0) {
      listed[listedCount] = i
      listedCount = (listedCount + 1) | 0
    }
  }
  return listedCount
}
