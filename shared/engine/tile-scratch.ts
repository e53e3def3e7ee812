import type { OutlookPlan } from './types'

/**
 * Samples are processed in tiles so every step is a stride-1 loop over typed arrays; the tile split
 * inside a block is fixed, so sums stay reproducible. A tile's working set stays in the core's L2 cache.
 */
export const TILE = 1024
/**
 * Rows are TILE values apart plus two cache lines. Addresses 4 KB apart fall in the same set of the
 * level-1 data cache (32 KB, 8 ways), so rows exactly 8 KB apart all competed for the same 8 lines:
 * a kernel touching seven rows, or two threads sharing a core, evicted its own data. Padded, the rows
 * spread over the sets (with the cell loop of `countOnePass`, W1 ran 3–8 % faster on one thread).
 */
export const ROW_PADDING = 16
export const ROW = TILE + ROW_PADDING

/** Working arrays of the sample loop. Their contents never outlive one call of `runBlocks`. */
export interface TileScratch {
  /**
   * Independent scores of a block: component 0's for every sample, then component 1's, …, land motion's
   * last, each row `count + ROW_PADDING` apart; then one zero row (padding).
   */
  independent: Float64Array
  /** Correlated score of component c for tile sample i at [c·ROW + i] (rows that are not a copy). */
  scores: Float64Array
  /** Per score row, where the tile's scores are read: `scores` or `independent`, and the offset. */
  scoreFrom: Float64Array[]
  scoreAt: Int32Array
  /** First anchor line of the piece or draw each sample picked, at [c·ROW + i]. */
  lineAt: Int32Array
  /**
   * The tile's value, basis and level rows in one array: the optimizing compiler checks a typed array's
   * map and bounds anew on every loop iteration, once per array object, so kernels that read several
   * kinds of row read them all from this one.
   */
  rows: Float64Array
  /**
   * Scaled anchor value of slot v less its all-scores-zero value, at rows[valuesAt + v·ROW + i]; row V stays zero
   * (padding).
   */
  valuesAt: number
  /**
   * Per column, the sum of its slots' centred values (land motion: the score) at rows[basisAt + j·ROW + i]: the basis
   * of the sums. Row J zero.
   */
  basisAt: number
  /**
   * Per basis column j, the sum of its slots' scaled anchor values at rows[levelsAt + j·ROW + i] (land
   * motion: the score); row J stays zero (padding). Each year's rise is formed from these when the plan
   * has draws, so a lone component's rise is its value exactly (a draw equal to a height does not exceed it).
   */
  levelsAt: number
  /**
   * The rows the value loop adds each anchor value into: the levels when a plan has uploaded draws (their
   * rises must be exact, so the basis is formed from the values afterwards), otherwise the basis (rises
   * are then formed from the basis about the all-scores-zero rise, which saves a pass over the values).
   */
  sumsAt: number
  sumsAreLevels: boolean
  /** Total rise per year at [t·ROW + i] (years of several passes, and for the Gumbel sums). */
  rise: Float64Array
  /** Tile samples of one year whose histogram cell holds a cut. */
  listed: Int32Array
  /** Working histogram counts of a call; the sign bit marks cells holding a cut (see `cutCells`). */
  histogram: Int32Array
  /** Per block: Σ basis, Σ basis_j·basis_k, Σ value, Σ value·basis_j. */
  basisSum: Float64Array
  basisCross: Float64Array
  valueSum: Float64Array
  valueCross: Float64Array
  /**
   * Observation-updated outlooks: the tile's weights (`weighTile`), else null, and the partial's weighted
   * sums, which the counting kernels add each sample's weight to beside its count (histogram cell at
   * `weightedHistogramAt + cell`, exceedance cell at `weightedCellsAt + t·(cuts + 1) + cell`).
   */
  weights: Float64Array | null
  weighted: Float64Array
  weightedHistogramAt: number
  weightedCellsAt: number
}

let kept: { key: string, scratch: TileScratch } | null = null

/**
 * Scratch for a plan's shape. The last one is kept for the next call of the same shape: a worker
 * samples request after request of the same sizes without allocating (and zeroing) a megabyte each time.
 * Safe because sampling is synchronous: one call at a time per thread.
 */
export function tileScratch(plan: OutlookPlan): TileScratch {
  const scoreRows = plan.componentKeys.length + 1
  const key = [
    plan.blockSize,
    scoreRows,
    plan.valueCount,
    plan.basisCount,
    plan.years.length,
    plan.histogramSize,
  ].join()
  if (kept?.key === key) return kept.scratch
  const columnCount = plan.basisCount
  const scratch: TileScratch = {
    independent: new Float64Array((plan.blockSize + ROW_PADDING) * scoreRows + ROW),
    scores: new Float64Array(scoreRows * ROW),
    scoreFrom: [],
    scoreAt: new Int32Array(scoreRows),
    lineAt: new Int32Array((scoreRows - 1) * ROW),
    rows: new Float64Array((plan.valueCount + 1 + 2 * (columnCount + 1)) * ROW),
    valuesAt: 0,
    basisAt: (plan.valueCount + 1) * ROW,
    levelsAt: (plan.valueCount + 1 + columnCount + 1) * ROW,
    sumsAt: 0,
    sumsAreLevels: true,
    rise: new Float64Array(plan.years.length * ROW),
    listed: new Int32Array(TILE),
    histogram: new Int32Array(plan.histogramSize),
    basisSum: new Float64Array(columnCount),
    basisCross: new Float64Array(columnCount * columnCount),
    valueSum: new Float64Array(plan.valueCount),
    valueCross: new Float64Array(plan.valueCount * columnCount),
    weights: null,
    weighted: new Float64Array(0),
    weightedHistogramAt: 0,
    weightedCellsAt: 0,
  }
  for (let c = 0; c < scoreRows; c++) scratch.scoreFrom.push(scratch.scores)
  kept = { key, scratch }
  return scratch
}
