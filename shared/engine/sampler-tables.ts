import { COMPONENT_KIND_DRAWS, COMPONENT_KIND_PIECEWISE, type OutlookPlan } from './types'

// Lookup tables the sample loop derives from a plan. They depend on the plan alone, so they are built
// once per plan (a worker samples the chunks of one plan many times) and kept while the plan lives.

/** The sign bit of a working histogram count: set in cells that hold a cut. */
export const HOLDS_CUT = -0x80000000

/** Columns combined per pass of the per-sample sums: each pass keeps four independent accumulators. */
export const PASS = 4
/** Anchor-value slots added per pass when a basis column is formed (W1: six components, two passes). */
export const SLOTS_PER_PASS = 3

export interface LifeSegment {
  /** Output-year index of the segment's start, or −1 for the baseline (rise 0). */
  from: number
  to: number
  /** Years between the two knots. */
  span: number
  /** The life's years in the segment: `steps` years from the start knot's year + `first`. */
  first: number
  steps: number
}

/** Two output years counted in one pass (see `tile-pairs.ts`). */
export interface YearPair {
  first: number
  second: number
  /** The union of the two years' columns, ascending, padded with the zero row to three. */
  columns: Int32Array
  /** The first year's weight on each of those columns, then the second's (zero where a year has none). */
  weights: Float64Array
}

export interface SamplerTables {
  /** Per year, the basis columns with a non-zero weight, padded with the zero row to whole passes. */
  yearColumns: Int32Array[]
  yearWeights: Float64Array[]
  /** Per year: true when every weight is zero, so every sample's rise is the land-motion intercept. */
  constantYear: Uint8Array
  /** Years counted two at a time, and per year whether it is in one of those pairs. */
  yearPairs: YearPair[]
  pairedYear: Uint8Array
  /** Per score row, the non-zero entries of its Cholesky row (land motion: itself), padded to passes. */
  choleskyColumns: Int32Array[]
  choleskyWeights: Float64Array[]
  /** Per score row: true when the row is the unit vector, so the score is the independent score itself. */
  identityRow: Uint8Array
  /** Per component, its breakpoints padded with +∞ to whole passes. */
  paddedBreakpoints: Float64Array[]
  /** Per component: true when its piece is found in the value loop itself (piecewise, ≤ one pass of breakpoints). */
  inlinePiece: Uint8Array
  /** Every basis column, padded with the zero row to whole passes. */
  allColumns: Int32Array
  /** Per component basis column, its anchor-value slots in order, padded with the zero row (slot count) to threes. */
  columnSlots: Int32Array[]
  /** Whether any component is uploaded draws, whose rises must be formed exactly (see `TileScratch.sumsAt`). */
  hasDraws: boolean
  /** Per histogram cell, its exceedance cell, or −1 − (cuts below it) when a cut falls inside it. */
  cellOfBin: Int32Array
  /**
   * The histogram cells holding a cut. The working histogram starts them at INT32_MIN (0 elsewhere), so
   * a count's sign says whether its samples need placing among the cuts one by one.
   */
  cutCells: Int32Array
  /** Per life span (`plan.lifeSpans`), its annual steps as runs between knots. */
  lifeSegments: LifeSegment[][]
  /** Per life span, the indices of the thresholds that have it. */
  lifeThresholds: Int32Array[]
}

const cache = new WeakMap<OutlookPlan, SamplerTables>()

/** The plan's tables, built on first use. */
export function samplerTables(plan: OutlookPlan): SamplerTables {
  let tables = cache.get(plan)
  if (!tables) {
    tables = buildTables(plan)
    cache.set(plan, tables)
  }
  return tables
}

function padded<T extends Int32Array | Float64Array>(make: (length: number) => T, used: number, fill: number): T {
  return make(Math.max(1, Math.ceil(used / PASS)) * PASS).fill(fill) as T
}

function buildTables(plan: OutlookPlan): SamplerTables {
  const columnCount = plan.basisCount
  const componentCount = plan.componentKeys.length
  const yearColumns: Int32Array[] = []
  const yearWeights: Float64Array[] = []
  const constantYear = new Uint8Array(plan.years.length)
  for (let t = 0; t < plan.years.length; t++) {
    const used: number[] = []
    for (let j = 0; j < columnCount; j++) if (plan.basisWeight[t * columnCount + j] !== 0) used.push(j)
    const columns = padded(n => new Int32Array(n), used.length, columnCount)
    const weights = padded(n => new Float64Array(n), used.length, 0)
    used.forEach((j, k) => {
      columns[k] = j
      weights[k] = plan.basisWeight[t * columnCount + j]!
    })
    yearColumns.push(columns)
    yearWeights.push(weights)
    constantYear[t] = used.length === 0 ? 1 : 0
  }

  // Score rows: components, then land motion (always independent). Padding points past the last row.
  const choleskyColumns: Int32Array[] = []
  const choleskyWeights: Float64Array[] = []
  const identityRow = new Uint8Array(componentCount + 1)
  for (let c = 0; c <= componentCount; c++) {
    const used: Array<[number, number]> = []
    if (c === componentCount) used.push([c, 1])
    else
      for (let k = 0; k <= c; k++)
        if (plan.cholesky[c * componentCount + k] !== 0) used.push([k, plan.cholesky[c * componentCount + k]!])
    const columns = padded(n => new Int32Array(n), used.length, componentCount + 1)
    const weights = padded(n => new Float64Array(n), used.length, 0)
    used.forEach(([k, weight], n) => {
      columns[n] = k
      weights[n] = weight
    })
    choleskyColumns.push(columns)
    choleskyWeights.push(weights)
    identityRow[c] = used.length === 1 && used[0]![0] === c && used[0]![1] === 1 ? 1 : 0
  }

  const paddedBreakpoints = Array.from(plan.kinds, (_, c) => {
    const count = plan.breakpointCount[c]!
    const breakpoints = padded(n => new Float64Array(n), count, Infinity)
    breakpoints.set(plan.breakpoints.subarray(plan.breakpointStart[c]!, plan.breakpointStart[c]! + count))
    return breakpoints
  })
  const inlinePiece = Uint8Array.from(plan.kinds, (kind, c) =>
    kind === COMPONENT_KIND_PIECEWISE && paddedBreakpoints[c]!.length === PASS ? 1 : 0,
  )

  const cellOfBin = exceedanceCellOfBin(plan)
  const columnSlots = Array.from({ length: columnCount - 1 }, (_, j) => {
    const used: number[] = []
    for (let slot = 0; slot < plan.valueCount; slot++) if (plan.valueBasis[slot] === j) used.push(slot)
    const slots = new Int32Array(Math.max(1, Math.ceil(used.length / SLOTS_PER_PASS)) * SLOTS_PER_PASS).fill(
      plan.valueCount,
    )
    slots.set(used)
    return slots
  })

  const yearPairs = pairYears(plan, yearColumns, yearWeights, constantYear)
  const pairedYear = new Uint8Array(plan.years.length)
  for (const pair of yearPairs) pairedYear[pair.first] = pairedYear[pair.second] = 1
  return {
    yearColumns,
    yearWeights,
    constantYear,
    yearPairs,
    pairedYear,
    choleskyColumns,
    choleskyWeights,
    identityRow,
    paddedBreakpoints,
    inlinePiece,
    allColumns: Int32Array.from({ length: Math.ceil(columnCount / PASS) * PASS }, (_, k) => Math.min(k, columnCount)),
    columnSlots,
    hasDraws: plan.kinds.some(kind => kind === COMPONENT_KIND_DRAWS),
    cellOfBin,
    cutCells: cutCellsOf(cellOfBin),
    lifeSegments: plan.lifeSpans.map(span => lifeSegments(plan.baselineYear, plan.years, span.startYear, span.years)),
    lifeThresholds: plan.lifeSpans.map((_, s) => {
      const indices: number[] = []
      plan.thresholds.forEach((threshold, k) => {
        if (threshold.lifeSpanIndex === s) indices.push(k)
      })
      return Int32Array.from(indices)
    }),
  }
}

/**
 * Consecutive years that `countOnePass` would count alone (one pass of at most three weighted columns,
 * no rise kept for the Gumbel sums) are paired while their columns together number three or fewer:
 * in W1, 2030 with 2040, 2050 with 2060, …, 2130 with 2140.
 */
function pairYears(
  plan: OutlookPlan,
  yearColumns: Int32Array[],
  yearWeights: Float64Array[],
  constantYear: Uint8Array,
): YearPair[] {
  const pairs: YearPair[] = []
  if (plan.gumbel !== null) return pairs
  const zeroRow = plan.basisCount
  const weighted = (t: number) => Array.from(yearColumns[t]!).filter((_, k) => yearWeights[t]![k] !== 0)
  const alone = (t: number) => !constantYear[t] && yearColumns[t]!.length === PASS && weighted(t).length <= 3
  let waiting = -1
  for (let t = 0; t < plan.years.length; t++) {
    if (!alone(t)) continue
    if (waiting < 0) {
      waiting = t
      continue
    }
    const union = [...new Set([...weighted(waiting), ...weighted(t)])].sort((a, b) => a - b)
    if (union.length > 3) {
      waiting = t
      continue
    }
    const columns = new Int32Array(3).fill(zeroRow)
    columns.set(union)
    const weights = new Float64Array(6)
    ;[waiting, t].forEach((year, y) => {
      yearColumns[year]!.forEach((column, k) => {
        const at = union.indexOf(column)
        if (at >= 0) weights[3 * y + at] = yearWeights[year]![k]!
      })
    })
    pairs.push({ first: waiting, second: t, columns, weights })
    waiting = -1
  }
  return pairs
}

function cutCellsOf(cellOfBin: Int32Array): Int32Array {
  const cells: number[] = []
  for (let cell = 0; cell < cellOfBin.length; cell++) if (cellOfBin[cell]! < 0) cells.push(cell)
  return Int32Array.from(cells)
}

/**
 * The annual steps startYear … startYear + lifeYears − 1 as runs between the knots: the baseline year
 * (rise 0) and the output years. A year on a knot belongs to the run ending there, except the baseline
 * year itself, which the first run includes. Every step must lie between the baseline and the last
 * output year (validation checks this).
 */
export function lifeSegments(
  baselineYear: number,
  years: readonly number[],
  startYear: number,
  lifeYears: number,
): LifeSegment[] {
  const segments: LifeSegment[] = []
  const end = startYear + lifeYears - 1
  let fromYear = baselineYear
  let from = -1
  let includesStart = true
  for (let t = 0; t < years.length && fromYear < end + (includesStart ? 1 : 0); t++) {
    const year = years[t]!
    if (year <= fromYear) {
      if (year === fromYear) from = t
      continue
    }
    const low = Math.max(startYear, includesStart ? fromYear : fromYear + 1)
    const high = Math.min(end, year)
    if (high >= low) segments.push({ from, to: t, span: year - fromYear, first: low - fromYear, steps: high - low + 1 })
    includesStart = false
    fromYear = year
    from = t
  }
  return segments
}

/**
 * Exceedance cells read from histogram cells. The cell index is monotone in the rise, so a histogram
 * cell that no cut falls in has the same number of cuts below every rise it holds: its samples are
 * moved to that exceedance cell wholesale at the end. A histogram cell holding a cut is marked
 * −1 − (cuts in earlier cells) and its samples are placed exactly, one by one.
 */
function exceedanceCellOfBin(plan: OutlookPlan): Int32Array {
  const cellOfBin = new Int32Array(plan.histogramSize)
  const inverseResolution = 1 / plan.histogramResolution
  const cutCount = plan.cuts.length
  const cutBins = new Int32Array(cutCount)
  for (let t = 0; t < plan.years.length; t++) {
    const low = plan.histogramLow[t]!
    const lastBin = plan.histogramBins[t]! + 1
    const at = plan.histogramOffset[t]!
    for (let cut = 0; cut < cutCount; cut++) {
      // The same arithmetic as the sample loop (`countYear`), so the comparison with a bin is exact.
      const cutBin = (plan.cuts[cut]! - low) * inverseResolution + 1
      cutBins[cut] = cutBin < 0 ? 0 : cutBin > lastBin ? lastBin : cutBin | 0
    }
    // Cuts are sorted, so their cells are too: `below` counts the cuts in earlier cells. Runs of cells
    // between cut cells are filled at once (this runs on every worker for every request).
    let below = 0
    let bin = 0
    while (below < cutCount) {
      const cutBin = cutBins[below]!
      cellOfBin.fill(below, at + bin, at + cutBin)
      cellOfBin[at + cutBin] = -1 - below
      while (below < cutCount && cutBins[below] === cutBin) below++
      bin = cutBin + 1
    }
    cellOfBin.fill(below, at + bin, at + lastBin + 1)
  }
  return cellOfBin
}
