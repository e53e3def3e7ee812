import type { SamplerTables, YearPair } from './sampler-tables'
import { ROW, TILE, type TileScratch } from './tile-scratch'
import { addCells, placeListed } from './tile-counts'
import type { OutlookPartial, OutlookPlan } from './types'

// Two years counted in one pass over the tile. Most output years lie between the same two anchor
// years, so their rises are weighted sums of the same three rows (two anchor columns and land motion):
// each sample's three values are read once for both years, and the loop runs once. On W1 that made the
// sample loop 1–3 % faster (each typed-array read costs the optimizing compiler a bounds check too).

/** Histogram cells of each tile sample for the pair's first and second year. */
const FIRST_CELLS = new Int32Array(TILE)
const SECOND_CELLS = new Int32Array(TILE)
/**
 * The pair's constants, handed to `pairCells` in one array: with its twenty-odd numbers as arguments
 * the loop ran slower (see `countOnePass`).
 */
const CONSTANTS = new Float64Array(13)

/**
 * Histogram, extremes and exceedance cells of a pair's two years. Each year's value is formed exactly
 * as `countOnePass` forms it (same terms, same order; a column the year does not use weighs zero and
 * adding a zero product leaves a sum unchanged), so a year counts the same in a pair or alone.
 */
export function countYearPair(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  pair: YearPair,
  tileCount: number,
  partial: OutlookPartial,
): void {
  const levelsAt = scratch.sumsAreLevels ? scratch.levelsAt : scratch.basisAt
  const first = pair.first
  const second = pair.second
  const constants = CONSTANTS
  for (let k = 0; k < 6; k++) constants[k] = pair.weights[k]!
  constants[6] = scratch.sumsAreLevels ? plan.landIntercept[first]! : plan.center[first]!
  constants[7] = scratch.sumsAreLevels ? plan.landIntercept[second]! : plan.center[second]!
  constants[8] = plan.histogramLow[first]!
  constants[9] = plan.histogramLow[second]!
  constants[10] = plan.histogramBins[first]! + 1
  constants[11] = plan.histogramBins[second]! + 1
  constants[12] = 1 / plan.histogramResolution
  pairCells(
    scratch.rows,
    levelsAt + pair.columns[0]! * ROW,
    levelsAt + pair.columns[1]! * ROW,
    levelsAt + pair.columns[2]! * ROW,
    plan.histogramOffset[first]!,
    plan.histogramOffset[second]!,
    tileCount,
    partial.minimum,
    partial.maximum,
    first,
    second,
  )
  const listed = scratch.listed
  placeListed(plan, tables, scratch, first, listed, addCells(scratch, FIRST_CELLS, tileCount), partial)
  placeListed(plan, tables, scratch, second, listed, addCells(scratch, SECOND_CELLS, tileCount), partial)
}

function pairCells(
  levels: Float64Array,
  b0: number,
  b1: number,
  b2: number,
  firstAt: number,
  secondAt: number,
  tileCount: number,
  minima: Float64Array,
  maxima: Float64Array,
  first: number,
  second: number,
): void {
  const constants = CONSTANTS
  const u0 = constants[0]!
  const u1 = constants[1]!
  const u2 = constants[2]!
  const v0 = constants[3]!
  const v1 = constants[4]!
  const v2 = constants[5]!
  const firstIntercept = constants[6]!
  const secondIntercept = constants[7]!
  const firstLow = constants[8]!
  const secondLow = constants[9]!
  const firstLastBin = constants[10]!
  const secondLastBin = constants[11]!
  const inverseResolution = constants[12]!
  // Cell indices as int32 from the start (see `countOnePass`).
  const firstStart = firstAt | 0
  const secondStart = secondAt | 0
  const firstLastCell = (firstAt + firstLastBin) | 0
  const secondLastCell = (secondAt + secondLastBin) | 0
  const firstCells = FIRST_CELLS
  const secondCells = SECOND_CELLS
  let firstMinimum = minima[first]!
  let firstMaximum = maxima[first]!
  let secondMinimum = minima[second]!
  let secondMaximum = maxima[second]!
  for (let i = 0; i < tileCount; i = (i + 1) | 0) {
    const x0 = levels[(b0 + i) | 0]!
    const x1 = levels[(b1 + i) | 0]!
    const x2 = levels[(b2 + i) | 0]!
    const a = firstIntercept + u0 * x0 + u1 * x1 + u2 * x2
    const b = secondIntercept + v0 * x0 + v1 * x1 + v2 * x2
    if (a < firstMinimum) firstMinimum = a
    if (a > firstMaximum) firstMaximum = a
    if (b < secondMinimum) secondMinimum = b
    if (b > secondMaximum) secondMaximum = b
    const aBin = (a - firstLow) * inverseResolution + 1
    const bBin = (b - secondLow) * inverseResolution + 1
    firstCells[i] = aBin < 0 ? firstStart : aBin > firstLastBin ? firstLastCell : (firstStart + (aBin | 0)) | 0
    secondCells[i] = bBin < 0 ? secondStart : bBin > secondLastBin ? secondLastCell : (secondStart + (bBin | 0)) | 0
  }
  minima[first] = firstMinimum
  maxima[first] = firstMaximum
  minima[second] = secondMinimum
  maxima[second] = secondMaximum
}
