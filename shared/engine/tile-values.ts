import type { LandDrawPlan } from './land-motion'
import { drawRank } from './releases'
import { PASS, type SamplerTables } from './sampler-tables'
import { ROW, ROW_PADDING, type TileScratch } from './tile-scratch'
import { COMPONENT_KIND_DRAWS, COMPONENT_KIND_PIECEWISE, type OutlookPlan } from './types'

// Scores → anchor values → basis levels, one tile at a time.

/**
 * Independent scores → correlated through the Cholesky factor (rows that are a unit vector read the
 * independent scores in place), and the anchor line of every sample whose piece is not found inline.
 * `count` is the block's sample count: independent row k starts at k·(count + ROW_PADDING).
 */
export function scoreTile(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  count: number,
  tileStart: number,
  tileCount: number,
): void {
  const componentCount = plan.componentKeys.length
  const { scores, independent } = scratch
  const stride = count + ROW_PADDING
  const zeroAt = (componentCount + 1) * (plan.blockSize + ROW_PADDING)
  const rowAt = (k: number) => (k > componentCount ? zeroAt : k * stride + tileStart)
  // Correlated score c = Σ_k L[c][k] · independent k over the non-zero entries of row c, four per pass
  // (padding reads the zero row); the land-motion score stays independent.
  for (let c = 0; c <= componentCount; c++) {
    if (tables.identityRow[c]) {
      scratch.scoreFrom[c] = independent
      scratch.scoreAt[c] = c * stride + tileStart
      continue
    }
    scratch.scoreFrom[c] = scores
    scratch.scoreAt[c] = c * ROW
    const columns = tables.choleskyColumns[c]!
    const weights = tables.choleskyWeights[c]!
    const at = c * ROW
    for (let p = 0; p < columns.length; p += PASS) {
      const k0 = rowAt(columns[p]!)
      const k1 = rowAt(columns[p + 1]!)
      const k2 = rowAt(columns[p + 2]!)
      const k3 = rowAt(columns[p + 3]!)
      const l0 = weights[p]!
      const l1 = weights[p + 1]!
      const l2 = weights[p + 2]!
      const l3 = weights[p + 3]!
      if (p === 0 && l2 === 0) {
        // Two entries or fewer (the padding weighs zero).
        for (let i = 0; i < tileCount; i++) scores[at + i] = l0 * independent[k0 + i]! + l1 * independent[k1 + i]!
      }
      else if (p === 0 && l3 === 0) {
        for (let i = 0; i < tileCount; i++)
          scores[at + i] = l0 * independent[k0 + i]! + l1 * independent[k1 + i]! + l2 * independent[k2 + i]!
      }
      else if (p === 0) {
        for (let i = 0; i < tileCount; i++) {
          scores[at + i]
            = l0 * independent[k0 + i]!
              + l1 * independent[k1 + i]!
              + l2 * independent[k2 + i]!
              + l3 * independent[k3 + i]!
        }
      }
      else {
        for (let i = 0; i < tileCount; i++) {
          scores[at + i]
            = scores[at + i]!
              + l0 * independent[k0 + i]!
              + l1 * independent[k1 + i]!
              + l2 * independent[k2 + i]!
              + l3 * independent[k3 + i]!
        }
      }
    }
  }
  for (let c = 0; c < componentCount; c++) {
    if (plan.kinds[c] === COMPONENT_KIND_PIECEWISE && !tables.inlinePiece[c])
      piecewiseLines(plan, tables, scratch, c, tileCount)
    else if (plan.kinds[c] === COMPONENT_KIND_DRAWS) drawLines(plan, scratch, c, tileCount)
  }
}

/**
 * Piece = number of breakpoints at or below the score, counted four at a time (padded with +∞) as a
 * sum of comparisons: no data-dependent branch in the loop body.
 */
function piecewiseLines(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  c: number,
  tileCount: number,
): void {
  const scores = scratch.scoreFrom[c]!
  const from = scratch.scoreAt[c]!
  const lineAt = scratch.lineAt
  const anchors = plan.anchorCount[c]!
  const padded = tables.paddedBreakpoints[c]!
  const at = c * ROW
  for (let k = 0; k < padded.length; k += PASS) {
    const p0 = padded[k]!
    const p1 = padded[k + 1]!
    const p2 = padded[k + 2]!
    const p3 = padded[k + 3]!
    const base = k === 0 ? plan.lineStart[c]! : 0
    for (let i = 0; i < tileCount; i++) {
      const z = scores[from + i]!
      const step = (+(z >= p0) + +(z >= p1) + +(z >= p2) + +(z >= p3)) * anchors
      lineAt[at + i] = (k === 0 ? base : lineAt[at + i]!) + step
    }
  }
}

/** Rank = number of breakpoints Φ⁻¹(j/n) at or below the score (`drawRank`). */
function drawLines(plan: OutlookPlan, scratch: TileScratch, c: number, tileCount: number): void {
  const scores = scratch.scoreFrom[c]!
  const from = scratch.scoreAt[c]!
  const breakpoints = plan.breakpoints
  const first = plan.breakpointStart[c]!
  const last = first + plan.breakpointCount[c]!
  const anchors = plan.anchorCount[c]!
  const lineBase = plan.lineStart[c]! - first * anchors
  const at = c * ROW
  for (let i = 0; i < tileCount; i++) {
    scratch.lineAt[at + i] = lineBase + drawRank(breakpoints, first, last, scores[from + i]!) * anchors
  }
}

/**
 * The land-motion column of land draws: the value of the sample's rank, picked by the land-motion score
 * or, joint with a release, at the rank of the release draw the sample picked (its line, from `drawLines`).
 */
function landDrawColumn(plan: OutlookPlan, scratch: TileScratch, land: LandDrawPlan, tileCount: number): void {
  const componentCount = plan.componentKeys.length
  const rows = scratch.rows
  const levels = scratch.levelsAt + (plan.basisCount - 1) * ROW
  const basis = scratch.basisAt + (plan.basisCount - 1) * ROW
  const valueByRank = land.valueByRank
  const c = land.linkedComponent
  if (c >= 0) {
    const lineAt = scratch.lineAt
    const at = c * ROW
    const base = plan.lineStart[c]!
    const anchors = plan.anchorCount[c]!
    for (let i = 0; i < tileCount; i++) {
      const value = valueByRank[((lineAt[at + i]! - base) / anchors) | 0]!
      rows[levels + i] = value
      rows[basis + i] = value
    }
    return
  }
  const scores = scratch.scoreFrom[componentCount]!
  const from = scratch.scoreAt[componentCount]!
  const breakpoints = land.breakpoints
  for (let i = 0; i < tileCount; i++) {
    const value = valueByRank[drawRank(breakpoints, 0, breakpoints.length, scores[from + i]!)]!
    rows[levels + i] = value
    rows[basis + i] = value
  }
}

/**
 * Each component's scaled anchor values less their all-scores-zero values (for the variance shares),
 * and per basis column the sum of its slots' values into the rows at `sumsAt`: the centred basis, or the plain
 * levels when the plan has draws. The land-motion column is its score in both (land draws: the draw's value).
 */
export function valueTile(plan: OutlookPlan, tables: SamplerTables, scratch: TileScratch, tileCount: number): void {
  const componentCount = plan.componentKeys.length
  const landColumn = plan.basisCount - 1
  scratch.rows.fill(0, scratch.sumsAt, scratch.sumsAt + landColumn * ROW)
  for (let c = 0; c < componentCount; c++) {
    const kind = plan.kinds[c]!
    const anchors = plan.anchorCount[c]!
    for (let a = 0; a < anchors; a++) {
      if (kind === COMPONENT_KIND_PIECEWISE) {
        // Anchors in threes (then ones): each sample's piece and score are read once per group.
        if (anchors - a >= 3) {
          if (tables.inlinePiece[c]) piecewiseThreeInline(plan, tables, scratch, c, a, tileCount)
          else piecewiseThree(plan, scratch, c, a, tileCount)
          a += 2
        }
        else piecewiseOne(plan, tables, scratch, c, a, tileCount)
      }
      else if (kind === COMPONENT_KIND_DRAWS) {
        drawOne(plan, scratch, c, a, tileCount)
      }
      else {
        lognormalOne(plan, scratch, c, a, tileCount)
      }
    }
  }
  if (plan.landDraws) {
    landDrawColumn(plan, scratch, plan.landDraws, tileCount)
    return
  }
  const landScores = scratch.scoreFrom[componentCount]!
  const landAt = scratch.scoreAt[componentCount]!
  scratch.rows.set(landScores.subarray(landAt, landAt + tileCount), scratch.levelsAt + landColumn * ROW)
  scratch.rows.set(landScores.subarray(landAt, landAt + tileCount), scratch.basisAt + landColumn * ROW)
}

/** Anchors a, a+1, a+2 of piecewise component c; the piece is found here (at most four breakpoints). */
function piecewiseThreeInline(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  c: number,
  a: number,
  tileCount: number,
): void {
  // Values and sums are rows of the same array (see `TileScratch.rows`).
  const values = scratch.rows
  const sums = values
  const scores = scratch.scoreFrom[c]!
  const from = scratch.scoreAt[c]!
  const intercepts = plan.anchorIntercept
  const slopes = plan.anchorSlope
  const anchors = plan.anchorCount[c]!
  const padded = tables.paddedBreakpoints[c]!
  const p0 = padded[0]!
  const p1 = padded[1]!
  const p2 = padded[2]!
  const p3 = padded[3]!
  const base = plan.lineStart[c]! + a
  const slot = plan.valueStart[c]! + a
  const o0 = scratch.valuesAt + slot * ROW
  const o1 = o0 + ROW
  const o2 = o1 + ROW
  const j0 = scratch.sumsAt + plan.valueBasis[slot]! * ROW
  const j1 = scratch.sumsAt + plan.valueBasis[slot + 1]! * ROW
  const j2 = scratch.sumsAt + plan.valueBasis[slot + 2]! * ROW
  const zero0 = plan.valueAtZero[slot]!
  const zero1 = plan.valueAtZero[slot + 1]!
  const zero2 = plan.valueAtZero[slot + 2]!
  // What is taken off each value before it is summed: its value at zero when the sums are the centred
  // basis, nothing when they are the levels (see `TileScratch.sumsAt`).
  const taken0 = scratch.sumsAreLevels ? 0 : zero0
  const taken1 = scratch.sumsAreLevels ? 0 : zero1
  const taken2 = scratch.sumsAreLevels ? 0 : zero2
  // A table of five levels has three breakpoints: the padding (+∞) is never reached, so skip it.
  const fourth = p3 !== Infinity
  // Index sums are `| 0`: without it each carries an int32 overflow check (see `countOnePass`).
  for (let i = 0; i < tileCount; i = (i + 1) | 0) {
    const z = scores[(from + i) | 0]!
    const line = (base + Math.imul(+(z >= p0) + +(z >= p1) + +(z >= p2) + (fourth ? +(z >= p3) : 0), anchors)) | 0
    const x0 = intercepts[line]! + slopes[line]! * z
    const x1 = intercepts[(line + 1) | 0]! + slopes[(line + 1) | 0]! * z
    const x2 = intercepts[(line + 2) | 0]! + slopes[(line + 2) | 0]! * z
    values[(o0 + i) | 0] = x0 - zero0
    values[(o1 + i) | 0] = x1 - zero1
    values[(o2 + i) | 0] = x2 - zero2
    sums[(j0 + i) | 0]! += x0 - taken0
    sums[(j1 + i) | 0]! += x1 - taken1
    sums[(j2 + i) | 0]! += x2 - taken2
  }
}

/** Anchors a, a+1, a+2 of piecewise component c, the piece already in `lineAt`. */
function piecewiseThree(plan: OutlookPlan, scratch: TileScratch, c: number, a: number, tileCount: number): void {
  const values = scratch.rows
  const sums = values
  const lineAt = scratch.lineAt
  const scores = scratch.scoreFrom[c]!
  const from = scratch.scoreAt[c]!
  const intercepts = plan.anchorIntercept
  const slopes = plan.anchorSlope
  const slot = plan.valueStart[c]! + a
  const at = c * ROW
  const o0 = scratch.valuesAt + slot * ROW
  const o1 = o0 + ROW
  const o2 = o1 + ROW
  const j0 = scratch.sumsAt + plan.valueBasis[slot]! * ROW
  const j1 = scratch.sumsAt + plan.valueBasis[slot + 1]! * ROW
  const j2 = scratch.sumsAt + plan.valueBasis[slot + 2]! * ROW
  const zero0 = plan.valueAtZero[slot]!
  const zero1 = plan.valueAtZero[slot + 1]!
  const zero2 = plan.valueAtZero[slot + 2]!
  // What is taken off each value before it is summed: its value at zero when the sums are the centred
  // basis, nothing when they are the levels (see `TileScratch.sumsAt`).
  const taken0 = scratch.sumsAreLevels ? 0 : zero0
  const taken1 = scratch.sumsAreLevels ? 0 : zero1
  const taken2 = scratch.sumsAreLevels ? 0 : zero2
  for (let i = 0; i < tileCount; i++) {
    const line = lineAt[at + i]! + a
    const z = scores[from + i]!
    const x0 = intercepts[line]! + slopes[line]! * z
    const x1 = intercepts[line + 1]! + slopes[line + 1]! * z
    const x2 = intercepts[line + 2]! + slopes[line + 2]! * z
    values[o0 + i] = x0 - zero0
    values[o1 + i] = x1 - zero1
    values[o2 + i] = x2 - zero2
    sums[j0 + i]! += x0 - taken0
    sums[j1 + i]! += x1 - taken1
    sums[j2 + i]! += x2 - taken2
  }
}

/** Anchor a of piecewise component c (the piece inline or from `lineAt`). */
function piecewiseOne(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  c: number,
  a: number,
  tileCount: number,
): void {
  const values = scratch.rows
  const sums = values
  const lineAt = scratch.lineAt
  const scores = scratch.scoreFrom[c]!
  const from = scratch.scoreAt[c]!
  const intercepts = plan.anchorIntercept
  const slopes = plan.anchorSlope
  const anchors = plan.anchorCount[c]!
  const slot = plan.valueStart[c]! + a
  const out = scratch.valuesAt + slot * ROW
  const into = scratch.sumsAt + plan.valueBasis[slot]! * ROW
  const zero = plan.valueAtZero[slot]!
  const taken = scratch.sumsAreLevels ? 0 : zero
  const at = c * ROW
  if (tables.inlinePiece[c]) {
    const padded = tables.paddedBreakpoints[c]!
    const p0 = padded[0]!
    const p1 = padded[1]!
    const p2 = padded[2]!
    const p3 = padded[3]!
    const base = plan.lineStart[c]! + a
    for (let i = 0; i < tileCount; i++) {
      const z = scores[from + i]!
      const line = base + (+(z >= p0) + +(z >= p1) + +(z >= p2) + +(z >= p3)) * anchors
      const level = intercepts[line]! + slopes[line]! * z
      values[out + i] = level - zero
      sums[into + i]! += level - taken
    }
    return
  }
  for (let i = 0; i < tileCount; i++) {
    const line = lineAt[at + i]! + a
    const level = intercepts[line]! + slopes[line]! * scores[from + i]!
    values[out + i] = level - zero
    sums[into + i]! += level - taken
  }
}

function drawOne(plan: OutlookPlan, scratch: TileScratch, c: number, a: number, tileCount: number): void {
  const values = scratch.rows
  const sums = values
  const lineAt = scratch.lineAt
  const intercepts = plan.anchorIntercept
  const slot = plan.valueStart[c]! + a
  const out = scratch.valuesAt + slot * ROW
  const into = scratch.sumsAt + plan.valueBasis[slot]! * ROW
  const zero = plan.valueAtZero[slot]!
  const taken = scratch.sumsAreLevels ? 0 : zero
  const at = c * ROW
  for (let i = 0; i < tileCount; i++) {
    const level = intercepts[lineAt[at + i]! + a]!
    values[out + i] = level - zero
    sums[into + i]! += level - taken
  }
}

function lognormalOne(plan: OutlookPlan, scratch: TileScratch, c: number, a: number, tileCount: number): void {
  // Values and sums are rows of the same array (see `TileScratch.rows`).
  const values = scratch.rows
  const sums = values
  const scores = scratch.scoreFrom[c]!
  const from = scratch.scoreAt[c]!
  const slot = plan.valueStart[c]! + a
  const out = scratch.valuesAt + slot * ROW
  const into = scratch.sumsAt + plan.valueBasis[slot]! * ROW
  const zero = plan.valueAtZero[slot]!
  const taken = scratch.sumsAreLevels ? 0 : zero
  const shift = plan.lognormalShift[slot]!
  const mu = plan.lognormalMu[slot]!
  const sigma = plan.lognormalSigma[slot]!
  const scale = plan.lognormalScale[slot]!
  for (let i = 0; i < tileCount; i++) {
    const level = scale * (shift + Math.exp(mu + sigma * scores[from + i]!))
    values[out + i] = level - zero
    sums[into + i]! += level - taken
  }
}
