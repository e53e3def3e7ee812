import { fillOpenUniforms, blockStreamState } from './rng'
import { standardNormalQuantiles } from './normal'
import { COMPONENT_KIND_DRAWS, COMPONENT_KIND_PIECEWISE, type OutlookPlan, type OutlookPartial } from './types'

// The sample loop. Everything it touches is a typed array hoisted into a local, nothing is allocated
// per sample, and each block draws from its own stream, so blocks may run on any thread in any order.
//
// Random stream order inside a block: for each sample, one uniform per component (in component order)
// and then one for land motion; each uniform becomes a score through Φ⁻¹.
//
// A component's rise in any year is a fixed mix of its anchor values (linear interpolation in time), so a
// sample is reduced to a few basis values (per-anchor sums over components sharing time weights, plus the
// land-motion score) before any year is formed: each year's rise is then a short weighted sum, and the
// moments and variance-share sums of every year follow from dot products of the basis values per block.

interface LifeSegment {
  /** Output-year index of the segment's start, or −1 for the baseline (rise 0). */
  from: number
  to: number
  /** Years between the two knots, and how many annual steps of the life fall in the segment. */
  span: number
  steps: number
}

/** Annual steps baseline+1 … baseline+life, as runs between the knots (baseline, output years). */
export function lifeSegments(plan: OutlookPlan, lifeYears: number): LifeSegment[] {
  const segments: LifeSegment[] = []
  const end = plan.baselineYear + lifeYears
  let fromYear = plan.baselineYear
  let from = -1
  for (let t = 0; t < plan.years.length && fromYear < end; t++) {
    const year = plan.years[t]!
    if (year <= fromYear) {
      if (year === fromYear) from = t
      continue
    }
    segments.push({ from, to: t, span: year - fromYear, steps: Math.min(year, end) - fromYear })
    fromYear = year
    from = t
  }
  return segments
}

/** Σ_{j=1..steps} exp(a + j·d), for a + j·d ≤ 0 on the run, without overflow or cancellation. */
function geometricRun(a: number, d: number, steps: number): number {
  if (d > 0) return Math.exp(a + steps * d) * (Math.expm1(-steps * d) / Math.expm1(-d))
  if (d < 0) return Math.exp(a + d) * (Math.expm1(steps * d) / Math.expm1(d))
  return steps * Math.exp(a)
}

export function emptyPartial(plan: OutlookPlan, firstBlock: number, blockCount: number): OutlookPartial {
  return {
    firstBlock,
    blockCount,
    samples: 0,
    cellCounts: new Uint32Array(plan.years.length * (plan.cuts.length + 1)),
    histogram: new Uint32Array(plan.histogramSize),
    minimum: new Float64Array(plan.years.length).fill(Infinity),
    maximum: new Float64Array(plan.years.length).fill(-Infinity),
    blockSums: new Float64Array(blockCount * plan.sumsPerBlock),
  }
}

/**
 * Samples are processed in tiles so every step is a stride-1 loop over typed arrays; the tile split
 * inside a block is fixed, so sums stay reproducible.
 */
const TILE = 1024
/** Columns combined per pass when a year's rise is formed from the basis. */
const PASS = 4

interface TileScratch {
  /** Correlated score of component c for tile sample i at [c·TILE + i]; land-motion scores last. */
  scores: Float64Array
  /** First anchor line of the piece or draw each sample picked, at [c·TILE + i]. */
  lineAt: Int32Array
  /** Scaled anchor value of slot v less its all-scores-zero value, at [v·TILE + i]. */
  values: Float64Array
  /** Basis value minus its all-scores-zero value at [j·TILE + i]; row J stays zero (padding). */
  basis: Float64Array
  /**
   * Like `basis` but not centred: each year's rise is formed from these, so a lone component's rise is
   * its value exactly (a draw equal to a height does not exceed it).
   */
  levels: Float64Array
  /** Total rise per year at [t·TILE + i]. */
  rise: Float64Array
  /** Per year, the basis columns with a non-zero weight, padded with the zero row to whole passes. */
  yearColumns: Int32Array[]
  yearWeights: Float64Array[]
  /** Per histogram cell, its exceedance cell, or −1 − (cuts below it) when a cut falls inside it. */
  cellOfBin: Int32Array
  /** Independent scores of the tile at [k·TILE + i] (land motion last), then a zero row. */
  independentTile: Float64Array
  /** Per score row, the non-zero entries of its Cholesky row (land motion: itself), padded to passes. */
  choleskyColumns: Int32Array[]
  choleskyWeights: Float64Array[]
  /** Per component, its breakpoints padded with +∞ to whole passes. */
  paddedBreakpoints: Float64Array[]
  /** Every basis column, padded with the zero row to whole passes. */
  allColumns: Int32Array
  /** Per block: Σ basis, Σ basis_j·basis_k, Σ value, Σ value·basis_j. */
  basisSum: Float64Array
  basisCross: Float64Array
  valueSum: Float64Array
  valueCross: Float64Array
  lifeSegments: LifeSegment[][]
}

function yearPasses(plan: OutlookPlan): { columns: Int32Array[]; weights: Float64Array[] } {
  const columnCount = plan.basisCount
  const columns: Int32Array[] = []
  const weights: Float64Array[] = []
  for (let t = 0; t < plan.years.length; t++) {
    const used: number[] = []
    for (let j = 0; j < columnCount; j++) if (plan.basisWeight[t * columnCount + j] !== 0) used.push(j)
    const padded = Math.max(1, Math.ceil(used.length / PASS)) * PASS
    const yearColumns = new Int32Array(padded).fill(columnCount)
    const yearWeights = new Float64Array(padded)
    used.forEach((j, k) => {
      yearColumns[k] = j
      yearWeights[k] = plan.basisWeight[t * columnCount + j]!
    })
    columns.push(yearColumns)
    weights.push(yearWeights)
  }
  return { columns, weights }
}

function choleskyPasses(plan: OutlookPlan): { choleskyColumns: Int32Array[]; choleskyWeights: Float64Array[] } {
  const componentCount = plan.componentKeys.length
  const zeroRow = componentCount + 1
  const choleskyColumns: Int32Array[] = []
  const choleskyWeights: Float64Array[] = []
  for (let c = 0; c <= componentCount; c++) {
    const used: Array<[number, number]> = []
    if (c === componentCount) used.push([c, 1])
    else for (let k = 0; k <= c; k++) if (plan.cholesky[c * componentCount + k] !== 0) used.push([k, plan.cholesky[c * componentCount + k]!])
    const padded = Math.max(1, Math.ceil(used.length / PASS)) * PASS
    const columns = new Int32Array(padded).fill(zeroRow)
    const weights = new Float64Array(padded)
    used.forEach(([k, weight], n) => {
      columns[n] = k
      weights[n] = weight
    })
    choleskyColumns.push(columns)
    choleskyWeights.push(weights)
  }
  return { choleskyColumns, choleskyWeights }
}

/** Samples blocks firstBlock … firstBlock+blockCount−1 and returns their mergeable statistics. */
export function runBlocks(plan: OutlookPlan, firstBlock: number, blockCount: number): OutlookPartial {
  if (
    !Number.isInteger(firstBlock) ||
    !Number.isInteger(blockCount) ||
    firstBlock < 0 ||
    blockCount < 0 ||
    firstBlock + blockCount > plan.blockCount
  ) {
    throw new RangeError(`blocks ${firstBlock}…${firstBlock + blockCount - 1} are outside this plan's ${plan.blockCount} blocks`)
  }
  const partial = emptyPartial(plan, firstBlock, blockCount)
  const yearCount = plan.years.length
  const componentCount = plan.componentKeys.length
  const scoresPerSample = componentCount + 1
  const columnCount = plan.basisCount
  const uniforms = new Float64Array(plan.blockSize * scoresPerSample)
  const independent = new Float64Array(plan.blockSize * scoresPerSample)
  const tails = new Int32Array(plan.blockSize * scoresPerSample)
  const passes = yearPasses(plan)
  const scratch: TileScratch = {
    scores: new Float64Array(scoresPerSample * TILE),
    lineAt: new Int32Array(componentCount * TILE),
    values: new Float64Array(plan.valueCount * TILE),
    basis: new Float64Array((columnCount + 1) * TILE),
    levels: new Float64Array((columnCount + 1) * TILE),
    rise: new Float64Array(yearCount * TILE),
    yearColumns: passes.columns,
    yearWeights: passes.weights,
    independentTile: new Float64Array((scoresPerSample + 1) * TILE),
    ...choleskyPasses(plan),
    cellOfBin: exceedanceCellOfBin(plan),
    paddedBreakpoints: Array.from(plan.kinds, (_, c) => {
      const count = plan.breakpointCount[c]!
      const padded = new Float64Array(Math.max(1, Math.ceil(count / PASS)) * PASS).fill(Infinity)
      padded.set(plan.breakpoints.subarray(plan.breakpointStart[c]!, plan.breakpointStart[c]! + count))
      return padded
    }),
    allColumns: Int32Array.from({ length: Math.ceil(columnCount / PASS) * PASS }, (_, k) => Math.min(k, columnCount)),
    basisSum: new Float64Array(columnCount),
    basisCross: new Float64Array(columnCount * columnCount),
    valueSum: new Float64Array(plan.valueCount),
    valueCross: new Float64Array(plan.valueCount * columnCount),
    lifeSegments: plan.lifeSpans.map((life) => lifeSegments(plan, life)),
  }
  for (let b = 0; b < blockCount; b++) {
    const blockIndex = firstBlock + b
    const count = Math.min(plan.blockSize, plan.samples - blockIndex * plan.blockSize)
    const stream = blockStreamState(plan.seed, blockIndex)
    fillOpenUniforms(stream, uniforms, count * scoresPerSample)
    standardNormalQuantiles(uniforms, independent, count * scoresPerSample, tails)
    scratch.basisSum.fill(0)
    scratch.basisCross.fill(0)
    scratch.valueSum.fill(0)
    scratch.valueCross.fill(0)
    for (let tileStart = 0; tileStart < count; tileStart += TILE) {
      const tileCount = Math.min(TILE, count - tileStart)
      scoreTile(plan, independent, tileStart, tileCount, scratch)
      valueTile(plan, tileCount, scratch)
      sumTile(plan, tileCount, scratch)
      for (let t = 0; t < yearCount; t++) {
        riseOfYear(plan, t, tileCount, scratch)
        countYear(plan, t, tileCount, scratch, partial)
      }
      if (plan.gumbel !== null) gumbelTile(plan, tileCount, scratch, partial.blockSums, b * plan.sumsPerBlock)
    }
    blockSumsByYear(plan, scratch, partial.blockSums, b * plan.sumsPerBlock)
    partial.samples += count
  }
  cellsFromHistogram(plan, scratch.cellOfBin, partial)
  return partial
}

/** Independent scores → correlated through the Cholesky factor, and each sample's anchor line. */
function scoreTile(plan: OutlookPlan, independent: Float64Array, tileStart: number, tileCount: number, scratch: TileScratch): void {
  const componentCount = plan.componentKeys.length
  const perSample = componentCount + 1
  const scores = scratch.scores
  const lineAt = scratch.lineAt
  const independentTile = scratch.independentTile
  for (let c = 0; c <= componentCount; c++) {
    const at = c * TILE
    let u = tileStart * perSample + c
    for (let i = 0; i < tileCount; i++, u += perSample) independentTile[at + i] = independent[u]!
  }
  // Correlated score c = Σ_k L[c][k] · independent k over the non-zero entries of row c, four per pass
  // (padding reads the zero row); the land-motion score stays independent.
  for (let c = 0; c <= componentCount; c++) {
    const columns = scratch.choleskyColumns[c]!
    const weights = scratch.choleskyWeights[c]!
    const at = c * TILE
    for (let p = 0; p < columns.length; p += PASS) {
      const k0 = columns[p]! * TILE
      const k1 = columns[p + 1]! * TILE
      const k2 = columns[p + 2]! * TILE
      const k3 = columns[p + 3]! * TILE
      const l0 = weights[p]!
      const l1 = weights[p + 1]!
      const l2 = weights[p + 2]!
      const l3 = weights[p + 3]!
      if (p === 0) {
        for (let i = 0; i < tileCount; i++) {
          scores[at + i] = l0 * independentTile[k0 + i]! + l1 * independentTile[k1 + i]! + l2 * independentTile[k2 + i]! + l3 * independentTile[k3 + i]!
        }
      } else {
        for (let i = 0; i < tileCount; i++) {
          scores[at + i] = scores[at + i]! + l0 * independentTile[k0 + i]! + l1 * independentTile[k1 + i]! + l2 * independentTile[k2 + i]! + l3 * independentTile[k3 + i]!
        }
      }
    }
  }
  const breakpoints = plan.breakpoints
  for (let c = 0; c < componentCount; c++) {
    const kind = plan.kinds[c]!
    const first = plan.breakpointStart[c]!
    const last = first + plan.breakpointCount[c]!
    const anchors = plan.anchorCount[c]!
    const lineBase = plan.lineStart[c]! - first * anchors
    const at = c * TILE
    if (kind === COMPONENT_KIND_PIECEWISE) {
      // Piece = number of breakpoints at or below the score, counted four at a time (padded with +∞)
      // as a sum of comparisons: no data-dependent branch in the loop body.
      const padded = scratch.paddedBreakpoints[c]!
      for (let k = 0; k < padded.length; k += PASS) {
        const p0 = padded[k]!
        const p1 = padded[k + 1]!
        const p2 = padded[k + 2]!
        const p3 = padded[k + 3]!
        const base = k === 0 ? lineBase + first * anchors : 0
        for (let i = 0; i < tileCount; i++) {
          const z = scores[at + i]!
          const step = (+(z >= p0) + +(z >= p1) + +(z >= p2) + +(z >= p3)) * anchors
          lineAt[at + i] = (k === 0 ? base : lineAt[at + i]!) + step
        }
      }
    } else if (kind === COMPONENT_KIND_DRAWS) {
      // Rank = number of breakpoints Φ⁻¹(j/n) at or below the score.
      for (let i = 0; i < tileCount; i++) {
        const z = scores[at + i]!
        let low = first
        let high = last
        while (low < high) {
          const middle = (low + high) >>> 1
          if (breakpoints[middle]! <= z) low = middle + 1
          else high = middle
        }
        lineAt[at + i] = lineBase + low * anchors
      }
    }
  }
}

/**
 * Each component's scaled anchor values less their all-scores-zero values, and the basis: their sums per
 * column. Centred values keep the covariance sums well conditioned when a part's spread is tiny next to
 * its level.
 */
function valueTile(plan: OutlookPlan, tileCount: number, scratch: TileScratch): void {
  const componentCount = plan.componentKeys.length
  const { scores, lineAt, values, basis, levels } = scratch
  const intercepts = plan.anchorIntercept
  const slopes = plan.anchorSlope
  const landColumn = plan.basisCount - 1
  basis.fill(0, 0, landColumn * TILE)
  levels.fill(0, 0, landColumn * TILE)
  for (let c = 0; c < componentCount; c++) {
    const kind = plan.kinds[c]!
    const at = c * TILE
    for (let a = 0; a < plan.anchorCount[c]!; a++) {
      const slot = plan.valueStart[c]! + a
      const out = slot * TILE
      const into = plan.valueBasis[slot]! * TILE
      const zero = plan.valueAtZero[slot]!
      if (kind === COMPONENT_KIND_PIECEWISE) {
        // Anchors in threes (then twos, ones): each sample's piece and score are read once per group.
        const width = Math.min(3, plan.anchorCount[c]! - a)
        if (width === 3) piecewiseThree(plan, c, a, tileCount, scratch)
        else if (width === 2) piecewiseTwo(plan, c, a, tileCount, scratch)
        else {
          for (let i = 0; i < tileCount; i++) {
            const line = lineAt[at + i]! + a
            const level = intercepts[line]! + slopes[line]! * scores[at + i]!
            values[out + i] = level - zero
            basis[into + i]! += level - zero
            levels[into + i]! += level
          }
        }
        a += width - 1
      } else if (kind === COMPONENT_KIND_DRAWS) {
        for (let i = 0; i < tileCount; i++) {
          const level = intercepts[lineAt[at + i]! + a]!
          values[out + i] = level - zero
          basis[into + i]! += level - zero
          levels[into + i]! += level
        }
      } else {
        const shift = plan.lognormalShift[slot]!
        const mu = plan.lognormalMu[slot]!
        const sigma = plan.lognormalSigma[slot]!
        const scale = plan.lognormalScale[slot]!
        for (let i = 0; i < tileCount; i++) {
          const level = scale * (shift + Math.exp(mu + sigma * scores[at + i]!))
          values[out + i] = level - zero
          basis[into + i]! += level - zero
          levels[into + i]! += level
        }
      }
    }
  }
  const landScores = scores.subarray(componentCount * TILE, componentCount * TILE + tileCount)
  basis.set(landScores, landColumn * TILE)
  levels.set(landScores, landColumn * TILE)
}

/** Anchors a, a+1, a+2 of piecewise component c over the tile (see `valueTile`). */
function piecewiseThree(plan: OutlookPlan, c: number, a: number, tileCount: number, scratch: TileScratch): void {
  const { scores, lineAt, values, basis, levels } = scratch
  const intercepts = plan.anchorIntercept
  const slopes = plan.anchorSlope
  const slot = plan.valueStart[c]! + a
  const at = c * TILE
  const o0 = slot * TILE
  const o1 = o0 + TILE
  const o2 = o1 + TILE
  const j0 = plan.valueBasis[slot]! * TILE
  const j1 = plan.valueBasis[slot + 1]! * TILE
  const j2 = plan.valueBasis[slot + 2]! * TILE
  const zero0 = plan.valueAtZero[slot]!
  const zero1 = plan.valueAtZero[slot + 1]!
  const zero2 = plan.valueAtZero[slot + 2]!
  for (let i = 0; i < tileCount; i++) {
    const line = lineAt[at + i]! + a
    const z = scores[at + i]!
    const x0 = intercepts[line]! + slopes[line]! * z
    const x1 = intercepts[line + 1]! + slopes[line + 1]! * z
    const x2 = intercepts[line + 2]! + slopes[line + 2]! * z
    values[o0 + i] = x0 - zero0
    values[o1 + i] = x1 - zero1
    values[o2 + i] = x2 - zero2
    basis[j0 + i]! += x0 - zero0
    basis[j1 + i]! += x1 - zero1
    basis[j2 + i]! += x2 - zero2
    levels[j0 + i]! += x0
    levels[j1 + i]! += x1
    levels[j2 + i]! += x2
  }
}

/** Anchors a, a+1 of piecewise component c over the tile (see `valueTile`). */
function piecewiseTwo(plan: OutlookPlan, c: number, a: number, tileCount: number, scratch: TileScratch): void {
  const { scores, lineAt, values, basis, levels } = scratch
  const intercepts = plan.anchorIntercept
  const slopes = plan.anchorSlope
  const slot = plan.valueStart[c]! + a
  const at = c * TILE
  const o0 = slot * TILE
  const o1 = o0 + TILE
  const j0 = plan.valueBasis[slot]! * TILE
  const j1 = plan.valueBasis[slot + 1]! * TILE
  const zero0 = plan.valueAtZero[slot]!
  const zero1 = plan.valueAtZero[slot + 1]!
  for (let i = 0; i < tileCount; i++) {
    const line = lineAt[at + i]! + a
    const z = scores[at + i]!
    const x0 = intercepts[line]! + slopes[line]! * z
    const x1 = intercepts[line + 1]! + slopes[line + 1]! * z
    values[o0 + i] = x0 - zero0
    values[o1 + i] = x1 - zero1
    basis[j0 + i]! += x0 - zero0
    basis[j1 + i]! += x1 - zero1
    levels[j0 + i]! += x0
    levels[j1 + i]! += x1
  }
}

/**
 * Dot products over the tile: everything the moments and variance shares of every year need. Four
 * columns per pass, each with its own accumulator, so the sums do not wait on one another.
 */
function sumTile(plan: OutlookPlan, tileCount: number, scratch: TileScratch): void {
  const columnCount = plan.basisCount
  const rowCount = columnCount + plan.valueCount
  const { values, basis } = scratch
  const columns = scratch.allColumns
  // Rows are the basis columns, then the anchor-value slots; two rows per pass share the column loads.
  for (let row = 0; row < rowCount; row += 2) {
    const second = Math.min(row + 1, rowCount - 1)
    const sourceA = row < columnCount ? basis : values
    const sourceB = second < columnCount ? basis : values
    const atA = (row < columnCount ? row : row - columnCount) * TILE
    const atB = (second < columnCount ? second : second - columnCount) * TILE
    let sumA = 0
    let sumB = 0
    for (let p = 0; p < columns.length; p += PASS) {
      const b0 = columns[p]! * TILE
      const b1 = columns[p + 1]! * TILE
      const b2 = columns[p + 2]! * TILE
      const b3 = columns[p + 3]! * TILE
      let a0 = 0
      let a1 = 0
      let a2 = 0
      let a3 = 0
      let c0 = 0
      let c1 = 0
      let c2 = 0
      let c3 = 0
      if (p === 0) {
        for (let i = 0; i < tileCount; i++) {
          const x = sourceA[atA + i]!
          const y = sourceB[atB + i]!
          const u0 = basis[b0 + i]!
          const u1 = basis[b1 + i]!
          const u2 = basis[b2 + i]!
          const u3 = basis[b3 + i]!
          sumA += x
          sumB += y
          a0 += x * u0
          a1 += x * u1
          a2 += x * u2
          a3 += x * u3
          c0 += y * u0
          c1 += y * u1
          c2 += y * u2
          c3 += y * u3
        }
      } else {
        for (let i = 0; i < tileCount; i++) {
          const x = sourceA[atA + i]!
          const y = sourceB[atB + i]!
          const u0 = basis[b0 + i]!
          const u1 = basis[b1 + i]!
          const u2 = basis[b2 + i]!
          const u3 = basis[b3 + i]!
          a0 += x * u0
          a1 += x * u1
          a2 += x * u2
          a3 += x * u3
          c0 += y * u0
          c1 += y * u1
          c2 += y * u2
          c3 += y * u3
        }
      }
      addCross(scratch, columnCount, row, columns, p, a0, a1, a2, a3)
      if (second !== row) addCross(scratch, columnCount, second, columns, p, c0, c1, c2, c3)
    }
    addSum(scratch, columnCount, row, sumA)
    if (second !== row) addSum(scratch, columnCount, second, sumB)
  }
}

/** Adds one pass's dot products of a row; padding columns point at the zero row and are not stored. */
function addCross(
  scratch: TileScratch,
  columnCount: number,
  row: number,
  columns: Int32Array,
  p: number,
  c0: number,
  c1: number,
  c2: number,
  c3: number,
): void {
  const target = row < columnCount ? scratch.basisCross : scratch.valueCross
  const at = (row < columnCount ? row : row - columnCount) * columnCount
  if (columns[p]! < columnCount) target[at + columns[p]!]! += c0
  if (columns[p + 1]! < columnCount) target[at + columns[p + 1]!]! += c1
  if (columns[p + 2]! < columnCount) target[at + columns[p + 2]!]! += c2
  if (columns[p + 3]! < columnCount) target[at + columns[p + 3]!]! += c3
}

function addSum(scratch: TileScratch, columnCount: number, row: number, sum: number): void {
  if (row < columnCount) scratch.basisSum[row]! += sum
  else scratch.valueSum[row - columnCount]! += sum
}

/**
 * rise(t) = land intercept + Σ_j weight_j · level_j over the tile, a few columns per pass: every pass but the
 * last, which `countYear` adds as it reads the rise.
 */
function riseOfYear(plan: OutlookPlan, t: number, tileCount: number, scratch: TileScratch): void {
  const { rise, levels } = scratch
  const columns = scratch.yearColumns[t]!
  const weights = scratch.yearWeights[t]!
  const out = t * TILE
  if (columns.length === PASS) return
  rise.fill(plan.landIntercept[t]!, out, out + tileCount)
  for (let p = 0; p + PASS < columns.length; p += PASS) {
    const b0 = columns[p]! * TILE
    const b1 = columns[p + 1]! * TILE
    const b2 = columns[p + 2]! * TILE
    const b3 = columns[p + 3]! * TILE
    const w0 = weights[p]!
    const w1 = weights[p + 1]!
    const w2 = weights[p + 2]!
    const w3 = weights[p + 3]!
    for (let i = 0; i < tileCount; i++) {
      rise[out + i] = rise[out + i]! + w0 * levels[b0 + i]! + w1 * levels[b1 + i]! + w2 * levels[b2 + i]! + w3 * levels[b3 + i]!
    }
  }
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
  for (let t = 0; t < plan.years.length; t++) {
    const low = plan.histogramLow[t]!
    const lastBin = plan.histogramBins[t]! + 1
    const at = plan.histogramOffset[t]!
    let cut = 0
    for (let bin = 0; bin <= lastBin; bin++) {
      let below = cut
      let holdsCut = false
      while (cut < plan.cuts.length) {
        // The same arithmetic as the sample loop, so the comparison with `bin` is exact.
        let cutBin = (plan.cuts[cut]! - low) * inverseResolution + 1
        cutBin = cutBin < 0 ? 0 : cutBin > lastBin ? lastBin : cutBin | 0
        if (cutBin > bin) break
        if (cutBin === bin) holdsCut = true
        else below++
        cut++
      }
      cellOfBin[at + bin] = holdsCut ? -1 - below : below
    }
  }
  return cellOfBin
}

/** Histogram, extremes, and the exceedance cell of samples in histogram cells that hold a cut, for year t. */
function countYear(plan: OutlookPlan, t: number, tileCount: number, scratch: TileScratch, partial: OutlookPartial): void {
  const rise = scratch.rise
  const cellOfBin = scratch.cellOfBin
  const cuts = plan.cuts
  const cutCount = cuts.length
  const inverseResolution = 1 / plan.histogramResolution
  const cellCounts = partial.cellCounts
  const histogram = partial.histogram
  const riseAt = t * TILE
  const low = plan.histogramLow[t]!
  const lastBin = plan.histogramBins[t]! + 1
  const histogramAt = plan.histogramOffset[t]!
  const cellAt = t * (cutCount + 1)
  const levels = scratch.levels
  const columns = scratch.yearColumns[t]!
  const weights = scratch.yearWeights[t]!
  // The last pass of the rise (padded with the zero row, weight 0).
  const last = columns.length - PASS
  const b0 = columns[last]! * TILE
  const b1 = columns[last + 1]! * TILE
  const b2 = columns[last + 2]! * TILE
  const b3 = columns[last + 3]! * TILE
  const w0 = weights[last]!
  const w1 = weights[last + 1]!
  const w2 = weights[last + 2]!
  const w3 = weights[last + 3]!
  // One pass (the usual case) starts from the land-motion intercept; more start from `riseOfYear`'s sums.
  const onePass = last === 0
  const intercept = plan.landIntercept[t]!
  // The Gumbel statistics read each year's rise back.
  const keepRise = plan.gumbel !== null
  let minimum = partial.minimum[t]!
  let maximum = partial.maximum[t]!
  for (let i = 0; i < tileCount; i++) {
    const value = (onePass ? intercept : rise[riseAt + i]!) + w0 * levels[b0 + i]! + w1 * levels[b1 + i]! + w2 * levels[b2 + i]! + w3 * levels[b3 + i]!
    if (keepRise) rise[riseAt + i] = value
    if (value < minimum) minimum = value
    if (value > maximum) maximum = value
    let bin = (value - low) * inverseResolution + 1
    bin = bin < 0 ? 0 : bin > lastBin ? lastBin : bin | 0
    const at = histogramAt + bin
    histogram[at]!++
    const cellHint = cellOfBin[at]!
    if (cellHint < 0) {
      let cell = -1 - cellHint
      while (cell < cutCount && cuts[cell]! < value) cell++
      cellCounts[cellAt + cell]!++
    }
  }
  partial.minimum[t] = minimum
  partial.maximum[t] = maximum
}

/** Adds the samples of histogram cells without a cut to their exceedance cells (a fresh partial only). */
function cellsFromHistogram(plan: OutlookPlan, cellOfBin: Int32Array, partial: OutlookPartial): void {
  const cellsPerYear = plan.cuts.length + 1
  for (let t = 0; t < plan.years.length; t++) {
    const at = plan.histogramOffset[t]!
    for (let bin = 0; bin <= plan.histogramBins[t]! + 1; bin++) {
      const cell = cellOfBin[at + bin]!
      if (cell >= 0) partial.cellCounts[t * cellsPerYear + cell]! += partial.histogram[at + bin]!
    }
  }
}

/**
 * A block's basis sums → its per-year sums. With x̃ an anchor value less its all-scores-zero value,
 * dev(t) = Σ_j w_tj·basis_j and a part's deviation p̃_c(t) = Σ_a w_t,j(a)·x̃_a: Σdev = Σ_j w_tj Σbasis_j,
 * Σdev² = Σ_jk w_tj w_tk Σbasis_j·basis_k, Σp̃·dev = Σ_a w_t,j(a) Σ_k w_tk Σx̃_a·basis_k. Land motion's
 * deviation is slope·score, its score being the last basis column.
 */
function blockSumsByYear(plan: OutlookPlan, scratch: TileScratch, sums: Float64Array, sumOffset: number): void {
  const columnCount = plan.basisCount
  const landColumn = columnCount - 1
  const componentCount = plan.componentKeys.length
  const partCount = componentCount + 1
  const { basisSum, basisCross, valueSum, valueCross } = scratch
  const weight = plan.basisWeight
  const momentsAt = sumOffset + plan.sumLayout.moments
  const partSumAt = sumOffset + plan.sumLayout.partSum
  const partCrossAt = sumOffset + plan.sumLayout.partCross
  for (let t = 0; t < plan.years.length; t++) {
    const row = t * columnCount
    let sum = 0
    let squares = 0
    for (let j = 0; j < columnCount; j++) {
      sum += weight[row + j]! * basisSum[j]!
      let inner = 0
      for (let k = 0; k < columnCount; k++) inner += weight[row + k]! * basisCross[j * columnCount + k]!
      squares += weight[row + j]! * inner
    }
    sums[momentsAt + 2 * t] = sum
    sums[momentsAt + 2 * t + 1] = squares
    for (let c = 0; c < componentCount; c++) {
      let partSum = 0
      let cross = 0
      for (let a = 0; a < plan.anchorCount[c]!; a++) {
        const slot = plan.valueStart[c]! + a
        const w = weight[row + plan.valueBasis[slot]!]!
        let inner = 0
        for (let k = 0; k < columnCount; k++) inner += weight[row + k]! * valueCross[slot * columnCount + k]!
        partSum += w * valueSum[slot]!
        cross += w * inner
      }
      sums[partSumAt + t * partCount + c] = partSum
      sums[partCrossAt + t * partCount + c] = cross
    }
    let landCross = 0
    for (let k = 0; k < columnCount; k++) landCross += weight[row + k]! * basisCross[landColumn * columnCount + k]!
    const landSlope = plan.landSlope[t]!
    sums[partSumAt + t * partCount + componentCount] = landSlope * basisSum[landColumn]!
    sums[partCrossAt + t * partCount + componentCount] = landSlope * landCross
  }
}

function gumbelTile(plan: OutlookPlan, tileCount: number, scratch: TileScratch, sums: Float64Array, sumOffset: number): void {
  const gumbel = plan.gumbel!
  const inverseScale = 1 / gumbel.scale
  const yearCount = plan.years.length
  const rise = scratch.rise
  const expAt = sumOffset + plan.sumLayout.gumbelExp
  const chanceAt = sumOffset + plan.sumLayout.returnChance
  const periods = gumbel.returnPeriods
  for (let t = 0; t < yearCount; t++) {
    const riseAt = t * TILE
    const center = plan.center[t]!
    let sum = 0
    for (let i = 0; i < tileCount; i++) sum += Math.exp((rise[riseAt + i]! - center) * inverseScale)
    sums[expAt + t]! += sum
    for (let r = 0; r < periods.length; r++) {
      // Annual chance of exceeding today's T-year level z_T after a rise: 1 − F(z_T − rise) =
      // 1 − exp(−y_T·e^{rise/λ}), with y_T = −ln(1 − 1/T).
      const reducedVariate = -Math.log1p(-1 / periods[r]!)
      let chance = 0
      for (let i = 0; i < tileCount; i++) chance -= Math.expm1(-reducedVariate * Math.exp(rise[riseAt + i]! * inverseScale))
      sums[chanceAt + t * periods.length + r]! += chance
    }
  }
  const lifeAt = sumOffset + plan.sumLayout.lifeNoExceedance
  for (let s = 0; s < scratch.lifeSegments.length; s++) {
    const segments = scratch.lifeSegments[s]!
    const lifeThresholds = plan.thresholds.filter((threshold) => threshold.lifeSpanIndex === s)
    for (let i = 0; i < tileCount; i++) {
      let peak = 0
      for (const segment of segments) {
        const to = rise[segment.to * TILE + i]! * inverseScale
        if (to > peak) peak = to
      }
      let total = 0
      for (const segment of segments) {
        const from = segment.from < 0 ? 0 : rise[segment.from * TILE + i]! * inverseScale
        const to = rise[segment.to * TILE + i]! * inverseScale
        total += geometricRun(from - peak, (to - from) / segment.span, segment.steps)
      }
      // ln Σ_years e^{rise/λ}; the chance of no exceedance in the life is Π_years F(h − rise) =
      // exp(−e^{−(h−μ)/λ} · Σ_years e^{rise/λ}).
      const logSum = peak + Math.log(total)
      for (const threshold of lifeThresholds) {
        sums[lifeAt + threshold.lifeSumIndex!]! += Math.exp(-Math.exp(logSum - (threshold.height - gumbel.location) * inverseScale))
      }
    }
  }
}
