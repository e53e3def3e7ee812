import { expOfNonPositive } from './exp'
import { PASS, type SamplerTables } from './sampler-tables'
import { countedByCells, rescaleWeightedCells } from './tile-counts'
import { ROW, TILE, type TileScratch } from './tile-scratch'
import type { OutlookPartial, OutlookPlan } from './types'

// Observation-updated statistics of a tile: each sample's log-likelihood under the observed record
// (`observation-plan.ts`) and its weight (`weighTile`, before the counting), then what the counting
// kernels do not add beside their counts (`addWeightedTile`). Both run only for plans with
// observations; the kernels test for weights once per call, so outlooks without a record run the loop
// they ran before.

const LOG_WEIGHT = new Float64Array(TILE)
const WEIGHT = new Float64Array(TILE)

/** A year's rise for the tile's samples, formed as the counting kernels form it. */
const RISE = new Float64Array(TILE)

/** Each sample's log-likelihood, less the plan's constant, into LOG_WEIGHT; returns the tile's largest. */
function logLikelihoods(plan: OutlookPlan, scratch: TileScratch, tileCount: number): number {
  const observations = plan.observations!
  const rowsAt = scratch.sumsAreLevels ? scratch.levelsAt : scratch.basisAt
  const linear = scratch.sumsAreLevels ? observations.linearLevels : observations.linearCentred
  // Terms three at a time, in the order of one pass per term (a padding term adds zero to a sum that
  // is never −0, which leaves it as it was): each sample's sum is the same bits with a third of the
  // passes over it.
  const zeroRow = rowsAt + plan.basisCount * ROW
  const needed = linear.length + observations.termCoefficient.length
  if (likelihoodTerms.coefficient.length < needed) likelihoodTerms = newTermList(needed)
  const terms = likelihoodTerms
  let termCount = 0
  for (let j = 0; j < linear.length; j++) {
    if (linear[j] === 0) continue
    terms.coefficient[termCount] = linear[j]!
    terms.first[termCount] = rowsAt + j * ROW
    terms.second[termCount] = -1
    termCount++
  }
  const first = observations.termFirst
  const second = observations.termSecond
  const coefficients = observations.termCoefficient
  for (let term = 0; term < coefficients.length; term++) {
    terms.coefficient[termCount] = coefficients[term]!
    terms.first[termCount] = rowsAt + first[term]! * ROW
    terms.second[termCount] = rowsAt + second[term]! * ROW
    termCount++
  }
  const out = LOG_WEIGHT
  out.fill(0, 0, tileCount)
  let linearEnd = 0
  while (linearEnd < termCount && terms.second[linearEnd] === -1) linearEnd++
  for (let t = 0; t < linearEnd; t += 3) {
    addLinearTerms(
      out,
      scratch.rows,
      terms.first[t]!,
      terms.coefficient[t]!,
      t + 1 < linearEnd ? terms.first[t + 1]! : zeroRow,
      t + 1 < linearEnd ? terms.coefficient[t + 1]! : 0,
      t + 2 < linearEnd ? terms.first[t + 2]! : zeroRow,
      t + 2 < linearEnd ? terms.coefficient[t + 2]! : 0,
      tileCount,
    )
  }
  for (let t = linearEnd; t < termCount; t += 3) {
    addQuadraticTerms(
      out,
      scratch.rows,
      terms.first[t]!,
      terms.second[t]!,
      terms.coefficient[t]!,
      t + 1 < termCount ? terms.first[t + 1]! : zeroRow,
      t + 1 < termCount ? terms.second[t + 1]! : zeroRow,
      t + 1 < termCount ? terms.coefficient[t + 1]! : 0,
      t + 2 < termCount ? terms.first[t + 2]! : zeroRow,
      t + 2 < termCount ? terms.second[t + 2]! : zeroRow,
      t + 2 < termCount ? terms.coefficient[t + 2]! : 0,
      tileCount,
    )
  }
  let largest = -Infinity
  for (let i = 0; i < tileCount; i++) if (out[i]! > largest) largest = out[i]!
  return largest
}

/**
 * Where each term of the log-likelihood reads its rows (second −1: a linear term), and its coefficient;
 * grown to the largest plan seen.
 */
let likelihoodTerms = newTermList(0)

function newTermList(size: number) {
  return { first: new Int32Array(size), second: new Int32Array(size), coefficient: new Float64Array(size) }
}

function addLinearTerms(
  out: Float64Array,
  rows: Float64Array,
  a0: number,
  c0: number,
  a1: number,
  c1: number,
  a2: number,
  c2: number,
  tileCount: number,
): void {
  for (let i = 0; i < tileCount; i = (i + 1) | 0)
    out[i] = out[i]! + c0 * rows[(a0 + i) | 0]! + c1 * rows[(a1 + i) | 0]! + c2 * rows[(a2 + i) | 0]!
}

function addQuadraticTerms(
  out: Float64Array,
  rows: Float64Array,
  a0: number,
  b0: number,
  c0: number,
  a1: number,
  b1: number,
  c1: number,
  a2: number,
  b2: number,
  c2: number,
  tileCount: number,
): void {
  for (let i = 0; i < tileCount; i = (i + 1) | 0) {
    out[i]
      = out[i]!
        + c0 * rows[(a0 + i) | 0]! * rows[(b0 + i) | 0]!
        + c1 * rows[(a1 + i) | 0]! * rows[(b1 + i) | 0]!
        + c2 * rows[(a2 + i) | 0]! * rows[(b2 + i) | 0]!
  }
}

/**
 * Year t's rise for the tile into RISE, with the same terms in the same order as `riseOfYear` and
 * `countYear` (so a sample falls in the same histogram cell as when it was counted).
 */
function riseOfTile(plan: OutlookPlan, tables: SamplerTables, scratch: TileScratch, t: number, tileCount: number) {
  const rows = scratch.rows
  const rowsAt = scratch.sumsAreLevels ? scratch.levelsAt : scratch.basisAt
  const columns = tables.yearColumns[t]!
  const weights = tables.yearWeights[t]!
  const rise = RISE
  rise.fill(scratch.sumsAreLevels ? plan.landIntercept[t]! : plan.center[t]!, 0, tileCount)
  const last = columns.length - PASS
  for (let p = 0; p < last; p += PASS) {
    const b0 = rowsAt + columns[p]! * ROW
    const b1 = rowsAt + columns[p + 1]! * ROW
    const b2 = rowsAt + columns[p + 2]! * ROW
    const b3 = rowsAt + columns[p + 3]! * ROW
    const w0 = weights[p]!
    const w1 = weights[p + 1]!
    const w2 = weights[p + 2]!
    const w3 = weights[p + 3]!
    for (let i = 0; i < tileCount; i++)
      rise[i] = rise[i]! + w0 * rows[b0 + i]! + w1 * rows[b1 + i]! + w2 * rows[b2 + i]! + w3 * rows[b3 + i]!
  }
  const b0 = rowsAt + columns[last]! * ROW
  const b1 = rowsAt + columns[last + 1]! * ROW
  const b2 = rowsAt + columns[last + 2]! * ROW
  const b3 = rowsAt + columns[last + 3]! * ROW
  const w0 = weights[last]!
  const w1 = weights[last + 1]!
  const w2 = weights[last + 2]!
  const w3 = weights[last + 3]!
  const used = w3 !== 0 ? 4 : w2 !== 0 ? 3 : 2
  for (let i = 0; i < tileCount; i++) {
    let value = rise[i]! + w0 * rows[b0 + i]! + w1 * rows[b1 + i]!
    if (used > 2) value += w2 * rows[b2 + i]!
    if (used > 3) value += w3 * rows[b3 + i]!
    rise[i] = value
  }
}

/**
 * Multiplies every weighted sum by e^{from − to} (Σw², at 1, by its square), so they are kept relative
 * to the larger scale `to`.
 */
export function rescaleWeighted(sums: Float64Array, from: number, to: number): void {
  // Before any sample (−∞) every sum is still zero.
  if (from === to || from === -Infinity) return
  const factor = Math.exp(from - to)
  for (let k = 0; k < sums.length; k++) sums[k] = sums[k]! * factor
  sums[1] = sums[1]! * factor
}

/**
 * The log of the weight, relative to the largest, below which a sample is weighed zero: the weights so
 * left out add up to less than 2⁻⁵³ of the largest weight, itself at most Σw, so every weighted sum moves
 * by less than one rounding of Σw and every weighted chance by less than half an ulp of 1. The largest
 * only grows during a run and on merging, so a weight left out against a smaller one is smaller still
 * against the last. With a few decades of record about a third of the trajectories fall below it
 * (≈ −48 at 100,000 samples), and their weights cost no exponential.
 */
export function negligibleLogWeight(samples: number): number {
  return -53 * Math.LN2 - Math.log(samples)
}

/**
 * Each tile sample's weight by the observed record, into the returned array (valid until the next
 * tile), with Σw and Σw² added to the partial's weighted sums. Needs the tile's basis rows only, so it
 * runs before the counting, which the trigger counts then share.
 */
export function weighTile(
  plan: OutlookPlan,
  scratch: TileScratch,
  tileCount: number,
  partial: OutlookPartial,
): Float64Array {
  const sums = partial.weighted
  const largest = logLikelihoods(plan, scratch, tileCount)
  // The scale only grows, a few times per partial: the sums so far are rescaled then.
  if (largest > partial.weightScale) {
    if (partial.weightScale !== -Infinity) rescaleWeightedCells(plan, Math.exp(partial.weightScale - largest))
    rescaleWeighted(sums, partial.weightScale, largest)
    partial.weightScale = largest
  }
  const scale = partial.weightScale
  const negligible = negligibleLogWeight(plan.samples)
  if (plan.basisCount <= FUSED_COLUMNS) {
    weighWithMoments(plan, scratch, tileCount, scale, negligible, sums)
    return WEIGHT
  }
  const weights = WEIGHT
  let total = 0
  let squares = 0
  for (let i = 0; i < tileCount; i++) {
    const logWeight = LOG_WEIGHT[i]! - scale
    const w = logWeight < negligible ? 0 : expOfNonPositive(logWeight)
    weights[i] = w
    total += w
    squares += w * w
  }
  sums[0]! += total
  sums[1]! += squares
  return weights
}

/** Plans of at most this many basis columns get their weighted moments as the weights are formed. */
const FUSED_COLUMNS = 4

/** A tile's sums of `weighWithMoments`: the four columns', then their products by row (k ≤ j). */
const TILE_MOMENTS = new Float64Array(FUSED_COLUMNS + (FUSED_COLUMNS * (FUSED_COLUMNS + 1)) / 2)

/**
 * `weighTile`'s weights and, in the same pass, `addMoments`'s sums for a plan of at most four basis
 * columns (the others read the zero row and are dropped): the sample's rows are read once, while its
 * weight is at hand. A sample of weight zero adds nothing to any sum (zero products leave a sum that
 * is never −0 as it was), so it is passed over; every sum adds its samples in order, as there.
 */
function weighWithMoments(
  plan: OutlookPlan,
  scratch: TileScratch,
  tileCount: number,
  scale: number,
  negligible: number,
  sums: Float64Array,
): void {
  const columns = plan.basisCount
  const rows = scratch.rows
  const rowsAt = scratch.sumsAreLevels ? scratch.levelsAt : scratch.basisAt
  const a0 = rowsAt
  const a1 = rowsAt + (columns > 1 ? 1 : columns) * ROW
  const a2 = rowsAt + (columns > 2 ? 2 : columns) * ROW
  const a3 = rowsAt + (columns > 3 ? 3 : columns) * ROW
  const weights = WEIGHT
  const logWeights = LOG_WEIGHT
  let total = 0
  let squares = 0
  let s0 = 0
  let s1 = 0
  let s2 = 0
  let s3 = 0
  let c00 = 0
  let c10 = 0
  let c11 = 0
  let c20 = 0
  let c21 = 0
  let c22 = 0
  let c30 = 0
  let c31 = 0
  let c32 = 0
  let c33 = 0
  for (let i = 0; i < tileCount; i = (i + 1) | 0) {
    const logWeight = logWeights[i]! - scale
    if (logWeight < negligible) {
      weights[i] = 0
      continue
    }
    const w = expOfNonPositive(logWeight)
    weights[i] = w
    total += w
    squares += w * w
    const x0 = rows[(a0 + i) | 0]!
    const x1 = rows[(a1 + i) | 0]!
    const x2 = rows[(a2 + i) | 0]!
    const x3 = rows[(a3 + i) | 0]!
    const u0 = w * x0
    const u1 = w * x1
    const u2 = w * x2
    const u3 = w * x3
    s0 += u0
    s1 += u1
    s2 += u2
    s3 += u3
    c00 += u0 * x0
    c10 += u1 * x0
    c11 += u1 * x1
    c20 += u2 * x0
    c21 += u2 * x1
    c22 += u2 * x2
    c30 += u3 * x0
    c31 += u3 * x1
    c32 += u3 * x2
    c33 += u3 * x3
  }
  sums[0]! += total
  sums[1]! += squares
  const tile = TILE_MOMENTS
  tile[0] = s0
  tile[1] = s1
  tile[2] = s2
  tile[3] = s3
  tile[4] = c00
  tile[5] = c10
  tile[6] = c11
  tile[7] = c20
  tile[8] = c21
  tile[9] = c22
  tile[10] = c30
  tile[11] = c31
  tile[12] = c32
  tile[13] = c33
  const momentsAt = plan.observations!.momentsAt
  for (let j = 0; j < columns; j++) {
    sums[momentsAt + j]! += tile[j]!
    const products = FUSED_COLUMNS + (j * (j + 1)) / 2
    for (let k = 0; k <= j; k++) sums[momentsAt + columns + j * columns + k]! += tile[products + k]!
  }
}

/**
 * The weighted sums of the basis rows and their products (each year's weighted mean and sd follow from
 * them): column j's sum and its products with columns k ≤ j, four k per pass (padding reads the zero
 * row and is dropped), independent sums in one loop instead of one latency-bound loop each. Every sum
 * adds its samples in order.
 */
function addMoments(plan: OutlookPlan, scratch: TileScratch, tileCount: number, sums: Float64Array): void {
  const observations = plan.observations!
  const weights = WEIGHT
  const rows = scratch.rows
  const rowsAt = scratch.sumsAreLevels ? scratch.levelsAt : scratch.basisAt
  const columns = plan.basisCount
  const crossAt = observations.momentsAt + columns
  for (let j = 0; j < columns; j++) {
    const a = rowsAt + j * ROW
    for (let k0 = 0; k0 <= j; k0 += 4) {
      const b0 = rowsAt + k0 * ROW
      const b1 = rowsAt + (k0 + 1 <= j ? k0 + 1 : columns) * ROW
      const b2 = rowsAt + (k0 + 2 <= j ? k0 + 2 : columns) * ROW
      const b3 = rowsAt + (k0 + 3 <= j ? k0 + 3 : columns) * ROW
      let sum = 0
      let cross0 = 0
      let cross1 = 0
      let cross2 = 0
      let cross3 = 0
      for (let i = 0; i < tileCount; i = (i + 1) | 0) {
        const weighted = weights[i]! * rows[(a + i) | 0]!
        sum += weighted
        cross0 += weighted * rows[(b0 + i) | 0]!
        cross1 += weighted * rows[(b1 + i) | 0]!
        cross2 += weighted * rows[(b2 + i) | 0]!
        cross3 += weighted * rows[(b3 + i) | 0]!
      }
      if (k0 === 0) sums[observations.momentsAt + j]! += sum
      const at = crossAt + j * columns + k0
      sums[at]! += cross0
      if (k0 + 1 <= j) sums[at + 1]! += cross1
      if (k0 + 2 <= j) sums[at + 2]! += cross2
      if (k0 + 3 <= j) sums[at + 3]! += cross3
    }
  }
}

/**
 * What the counting kernels do not add for the tile's weights: the weighted sums of the basis rows and
 * their products for plans wider than `weighWithMoments` takes, and the weighted histogram of years
 * whose cells the kernels do not list (`countedByCells`), their rise formed again.
 */
export function addWeightedTile(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  tileCount: number,
  partial: OutlookPartial,
): void {
  const observations = plan.observations!
  const sums = partial.weighted
  const weights = WEIGHT
  if (plan.basisCount > FUSED_COLUMNS) addMoments(plan, scratch, tileCount, sums)
  const inverseResolution = 1 / plan.histogramResolution
  const rise = RISE
  for (let t = 0; t < plan.years.length; t++) {
    if (countedByCells(plan, tables, t)) continue
    riseOfTile(plan, tables, scratch, t, tileCount)
    const low = plan.histogramLow[t]!
    const lastBin = plan.histogramBins[t]! + 1
    const histogramAt = observations.histogramAt + plan.histogramOffset[t]!
    for (let i = 0; i < tileCount; i++) {
      let bin = (rise[i]! - low) * inverseResolution + 1
      bin = bin < 0 ? 0 : bin > lastBin ? lastBin : bin | 0
      sums[histogramAt + bin]! += weights[i]!
    }
  }
}
