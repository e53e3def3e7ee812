import { fillOpenUniforms, blockStreamState } from './rng'
import { standardNormalQuantile } from './normal'
import { COMPONENT_KIND_DRAWS, COMPONENT_KIND_LOGNORMAL, COMPONENT_KIND_PIECEWISE, type OutlookPlan, type OutlookPartial } from './types'

// The sample loop. Everything it touches is a typed array hoisted into a local, nothing is allocated
// per sample, and each block draws from its own stream, so blocks may run on any thread in any order.
//
// Random stream order inside a block: for each sample, one uniform per component (in component order)
// and then one for land motion; each uniform becomes a score through Φ⁻¹.

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
 * Samples are processed in tiles, year by year across the tile, so every statistic is a stride-1 loop
 * that reduces into local variables; the tile split inside a block is fixed, so sums stay reproducible.
 */
const TILE = 1024

interface TileScratch {
  /** Correlated score of component c for tile sample i at [c·TILE + i]; land-motion scores last. */
  scores: Float64Array
  /** First table row of the piece or draw each sample picked, times the year count, at [c·TILE + i]. */
  rowAt: Int32Array
  /** Lognormal level of anchor row a at [a·TILE + i]. */
  levels: Float64Array
  /** Rise of each part at [p·TILE + i] for the current year. */
  parts: Float64Array
  /** Total rise per year at [t·TILE + i]. */
  rise: Float64Array
  deviation: Float64Array
  lifeSegments: LifeSegment[][]
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
  const uniforms = new Float64Array(plan.blockSize * scoresPerSample)
  const scratch: TileScratch = {
    scores: new Float64Array(scoresPerSample * TILE),
    rowAt: new Int32Array(componentCount * TILE),
    levels: new Float64Array(plan.lognormalShift.length * TILE),
    parts: new Float64Array(scoresPerSample * TILE),
    rise: new Float64Array(yearCount * TILE),
    deviation: new Float64Array(TILE),
    lifeSegments: plan.lifeSpans.map((life) => lifeSegments(plan, life)),
  }
  for (let b = 0; b < blockCount; b++) {
    const blockIndex = firstBlock + b
    const count = Math.min(plan.blockSize, plan.samples - blockIndex * plan.blockSize)
    const stream = blockStreamState(plan.seed, blockIndex)
    fillOpenUniforms(stream, uniforms, count * scoresPerSample)
    for (let tileStart = 0; tileStart < count; tileStart += TILE) {
      const tileCount = Math.min(TILE, count - tileStart)
      scoreTile(plan, uniforms, tileStart, tileCount, scratch)
      summariseTile(plan, tileCount, scratch, partial, b * plan.sumsPerBlock)
      if (plan.gumbel !== null) gumbelTile(plan, tileCount, scratch, partial.blockSums, b * plan.sumsPerBlock)
    }
    partial.samples += count
  }
  return partial
}

/** Uniforms → scores (Φ⁻¹), correlated through the Cholesky factor, and each sample's table row. */
function scoreTile(plan: OutlookPlan, uniforms: Float64Array, tileStart: number, tileCount: number, scratch: TileScratch): void {
  const componentCount = plan.componentKeys.length
  const perSample = componentCount + 1
  const scores = scratch.scores
  const rowAt = scratch.rowAt
  const cholesky = plan.cholesky
  const yearCount = plan.years.length
  for (let c = 0; c <= componentCount; c++) {
    const at = c * TILE
    for (let i = 0; i < tileCount; i++) scores[at + i] = standardNormalQuantile(uniforms[(tileStart + i) * perSample + c]!)
  }
  if (!plan.choleskyIsIdentity) {
    // In place from the last component down: row c only needs independent scores 0…c.
    for (let c = componentCount - 1; c >= 0; c--) {
      const row = c * componentCount
      const at = c * TILE
      for (let i = 0; i < tileCount; i++) {
        let value = 0
        for (let k = 0; k <= c; k++) value += cholesky[row + k]! * scores[k * TILE + i]!
        scores[at + i] = value
      }
    }
  }
  const breakpoints = plan.breakpoints
  for (let c = 0; c < componentCount; c++) {
    const kind = plan.kinds[c]!
    const first = plan.breakpointStart[c]!
    const last = first + plan.breakpointCount[c]!
    const rowBase = plan.rowStart[c]! - first
    const at = c * TILE
    if (kind === COMPONENT_KIND_PIECEWISE) {
      for (let i = 0; i < tileCount; i++) {
        const z = scores[at + i]!
        let k = first
        while (k < last && z >= breakpoints[k]!) k++
        rowAt[at + i] = (rowBase + k) * yearCount
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
        rowAt[at + i] = (rowBase + low) * yearCount
      }
    }
  }
}

/** Lognormal levels shift + exp(mu + sigma·z) of every lognormal anchor, once per tile. */
function lognormalTile(plan: OutlookPlan, tileCount: number, scratch: TileScratch): void {
  const { scores, levels } = scratch
  for (let c = 0; c < plan.componentKeys.length; c++) {
    if (plan.kinds[c] !== COMPONENT_KIND_LOGNORMAL) continue
    const at = c * TILE
    const first = plan.rowStart[c]!
    for (let a = first; a < first + plan.anchorCount[c]!; a++) {
      const shift = plan.lognormalShift[a]!
      const mu = plan.lognormalMu[a]!
      const sigma = plan.lognormalSigma[a]!
      for (let i = 0; i < tileCount; i++) levels[a * TILE + i] = shift + Math.exp(mu + sigma * scores[at + i]!)
    }
  }
}

/** Each part's rise in year t into scratch.parts, and their total into scratch.rise. */
function yearTile(plan: OutlookPlan, t: number, tileCount: number, scratch: TileScratch): void {
  const yearCount = plan.years.length
  const componentCount = plan.componentKeys.length
  const { scores, rowAt, parts, levels, rise } = scratch
  const riseAt = t * TILE
  const landAt = componentCount * TILE
  const landIntercept = plan.landIntercept[t]!
  const landSlope = plan.landSlope[t]!
  for (let i = 0; i < tileCount; i++) {
    const value = landIntercept + landSlope * scores[landAt + i]!
    parts[landAt + i] = value
    rise[riseAt + i] = value
  }
  for (let c = 0; c < componentCount; c++) {
    const kind = plan.kinds[c]!
    const at = c * TILE
    if (kind === COMPONENT_KIND_PIECEWISE) {
      const intercepts = plan.pieceIntercept
      const slopes = plan.pieceSlope
      for (let i = 0; i < tileCount; i++) {
        const row = rowAt[at + i]! + t
        const value = intercepts[row]! + slopes[row]! * scores[at + i]!
        parts[at + i] = value
        rise[riseAt + i]! += value
      }
    } else if (kind === COMPONENT_KIND_DRAWS) {
      const drawRise = plan.drawRise
      for (let i = 0; i < tileCount; i++) {
        const value = drawRise[rowAt[at + i]! + t]!
        parts[at + i] = value
        rise[riseAt + i]! += value
      }
    } else {
      const first = plan.rowStart[c]!
      for (let i = 0; i < tileCount; i++) parts[at + i] = 0
      for (let a = first; a < first + plan.anchorCount[c]!; a++) {
        const weight = plan.anchorWeight[a * yearCount + t]!
        if (weight === 0) continue
        for (let i = 0; i < tileCount; i++) parts[at + i]! += weight * levels[a * TILE + i]!
      }
      for (let i = 0; i < tileCount; i++) rise[riseAt + i]! += parts[at + i]!
    }
  }
}

/** Rise, histogram, exceedance cells, moments and variance-share sums of the tile, year by year. */
function summariseTile(plan: OutlookPlan, tileCount: number, scratch: TileScratch, partial: OutlookPartial, sumOffset: number): void {
  const yearCount = plan.years.length
  const partCount = plan.partKeys.length
  const { rise, deviation, parts } = scratch
  const cuts = plan.cuts
  const cutCount = cuts.length
  const cellsPerYear = cutCount + 1
  const bucketStart = plan.cutBucketStart
  const bucketLast = bucketStart.length - 1
  const bucketOrigin = plan.cutBucketOrigin
  const bucketInverseWidth = plan.cutBucketInverseWidth
  const inverseResolution = 1 / plan.histogramResolution
  const cellCounts = partial.cellCounts
  const histogram = partial.histogram
  const sums = partial.blockSums
  const momentsAt = sumOffset + plan.sumLayout.moments
  const partSumAt = sumOffset + plan.sumLayout.partSum
  const partCrossAt = sumOffset + plan.sumLayout.partCross

  lognormalTile(plan, tileCount, scratch)
  for (let t = 0; t < yearCount; t++) {
    yearTile(plan, t, tileCount, scratch)
    const riseAt = t * TILE
    const low = plan.histogramLow[t]!
    const lastBin = plan.histogramBins[t]! + 1
    const histogramAt = plan.histogramOffset[t]!
    const cellAt = t * cellsPerYear
    const center = plan.center[t]!
    let minimum = partial.minimum[t]!
    let maximum = partial.maximum[t]!
    let sum = 0
    let sumSquares = 0
    for (let i = 0; i < tileCount; i++) {
      const value = rise[riseAt + i]!
      if (value < minimum) minimum = value
      if (value > maximum) maximum = value

      let bin = (value - low) * inverseResolution + 1
      bin = bin < 0 ? 0 : bin > lastBin ? lastBin : bin | 0
      histogram[histogramAt + bin]!++

      let bucket = (value - bucketOrigin) * bucketInverseWidth
      bucket = bucket < 0 ? 0 : bucket > bucketLast ? bucketLast : bucket | 0
      let cell = bucketStart[bucket]!
      while (cell > 0 && cuts[cell - 1]! >= value) cell--
      while (cell < cutCount && cuts[cell]! < value) cell++
      cellCounts[cellAt + cell]!++

      const shifted = value - center
      deviation[i] = shifted
      sum += shifted
      sumSquares += shifted * shifted
    }
    partial.minimum[t] = minimum
    partial.maximum[t] = maximum
    sums[momentsAt + 2 * t]! += sum
    sums[momentsAt + 2 * t + 1]! += sumSquares

    for (let p = 0; p < partCount; p++) {
      const at = p * TILE
      let partSum = 0
      let cross = 0
      for (let i = 0; i < tileCount; i++) {
        const value = parts[at + i]!
        partSum += value
        cross += value * deviation[i]!
      }
      sums[partSumAt + t * partCount + p]! += partSum
      sums[partCrossAt + t * partCount + p]! += cross
    }
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
