import { blockStreamState } from './rng'
import { fillNormalScores } from './ziggurat'
import { HOLDS_CUT, samplerTables } from './sampler-tables'
import { ROW_PADDING, TILE, tileScratch } from './tile-scratch'
import { scoreTile, valueTile } from './tile-values'
import { basisFromValues, blockSumsByYear, gumbelTile, sumTile } from './tile-sums'
import { countConstantYear, countYear, finishCounts, finishWeightedCells, riseOfYear, startWeightedCells } from './tile-counts'
import { countYearPair } from './tile-pairs'
import { floodAnnualTile, triggerTile } from './tile-triggers'
import { addWeightedTile, weighTile } from './tile-weights'
import { drawParameterScores, tileParameters } from './gumbel-uncertainty'
import type { OutlookPlan, OutlookPartial } from './types'

// The sample loop. Everything it touches is a typed array hoisted into a local, nothing is allocated
// per sample or per block, and each block draws from its own stream, so blocks may run on any thread
// in any order.
//
// Random stream order inside a block of n samples: n scores for component 0 (one per sample, in
// sample order), then n for component 1, …, then n for land motion, each drawn from the block's stream
// by the ziggurat method (`ziggurat.ts`).
//
// A component's rise in any year is a fixed mix of its anchor values (linear interpolation in time), so a
// sample is reduced to a few basis values (per-anchor sums over components sharing time weights, plus the
// land-motion score) before any year is formed: each year's rise is then a short weighted sum, and the
// moments and variance-share sums of every year follow from dot products of the basis values per block.

const NO_SUMS = new Float64Array(0)

/** An empty partial for `blockCount` blocks (their indices and sums still to be filled in). */
export function emptyPartial(plan: OutlookPlan, blockCount: number): OutlookPartial {
  return {
    blocks: new Int32Array(blockCount),
    samples: 0,
    cellCounts: new Uint32Array(plan.years.length * (plan.cuts.length + 1)),
    histogram: new Uint32Array(plan.histogramSize),
    lifeHistogram: new Uint32Array(plan.lifeHistogramSize),
    triggerCounts: new Int32Array(plan.trigger ? plan.trigger.heights.length * (plan.trigger.yearCount + 1) : 0),
    minimum: new Float64Array(plan.years.length).fill(Infinity),
    maximum: new Float64Array(plan.years.length).fill(-Infinity),
    blockSums: new Float64Array(blockCount * plan.sumsPerBlock),
    weighted: new Float64Array(plan.observations ? plan.observations.size : 0),
    weightScale: -Infinity,
  }
}

/**
 * Where a thread gets its next block: a block index, or −1 when none is left. Threads sharing a run
 * draw from one counter, so a thread that runs slower (or starts later) simply samples fewer blocks.
 */
export type NextBlock = () => number

/**
 * Claims on a counter shared by threads (a SharedArrayBuffer): each call takes the next block, −1 when all are taken.
 */
export function claimFromCounter(counter: Int32Array, blockCount: number): NextBlock {
  return () => {
    const block = Atomics.add(counter, 0, 1)
    return block < blockCount ? block : -1
  }
}

/** Samples blocks firstBlock … firstBlock+blockCount−1 and returns their mergeable statistics. */
export function runBlocks(plan: OutlookPlan, firstBlock: number, blockCount: number): OutlookPartial {
  if (
    !Number.isInteger(firstBlock)
    || !Number.isInteger(blockCount)
    || firstBlock < 0
    || blockCount < 0
    || firstBlock + blockCount > plan.blockCount
  ) {
    throw new RangeError(
      `blocks ${firstBlock}…${firstBlock + blockCount - 1} are outside this plan's ${plan.blockCount} blocks`,
    )
  }
  let next = firstBlock
  const end = firstBlock + blockCount
  return runClaimedBlocks(plan, () => (next < end ? next++ : -1), blockCount)
}

/**
 * Samples every block `nextBlock` hands out, until it answers −1 (or `capacity` blocks are done), into
 * one partial. Blocks must come in ascending order (a shared counter gives them so); each is sampled
 * from its own stream, so the merged statistics are the same bits however the blocks were shared out.
 */
export function runClaimedBlocks(
  plan: OutlookPlan,
  nextBlock: NextBlock,
  capacity: number = plan.blockCount,
): OutlookPartial {
  const partial = emptyPartial(plan, capacity)
  const tables = samplerTables(plan)
  const scratch = tileScratch(plan)
  scratch.histogram.fill(0)
  for (let k = 0; k < tables.cutCells.length; k++) scratch.histogram[tables.cutCells[k]!] = HOLDS_CUT
  scratch.sumsAreLevels = tables.hasDraws
  scratch.sumsAt = tables.hasDraws ? scratch.levelsAt : scratch.basisAt
  const yearCount = plan.years.length
  const scoresPerSample = plan.componentKeys.length + 1
  const uncertain = plan.gumbel?.uncertainty != null
  const weighted = plan.observations !== null
  scratch.weights = null
  scratch.weighted = partial.weighted
  scratch.weightedHistogramAt = plan.observations?.histogramAt ?? 0
  scratch.weightedCellsAt = plan.observations?.cellsAt ?? 0
  if (weighted) startWeightedCells(plan)
  let done = 0
  for (let b = 0; b < capacity; b++) {
    const blockIndex = nextBlock()
    if (blockIndex === -1) break
    if (
      !Number.isInteger(blockIndex)
      || blockIndex < 0
      || blockIndex >= plan.blockCount
      || (b > 0 && blockIndex <= partial.blocks[b - 1]!)
    ) {
      throw new RangeError(
        `block ${blockIndex} is not a next block of this plan's ${plan.blockCount}: blocks come once each, in ascending order`,
      )
    }
    partial.blocks[b] = blockIndex
    done = b + 1
    const count = Math.min(plan.blockSize, plan.samples - blockIndex * plan.blockSize)
    const stream = blockStreamState(plan.seed, blockIndex)
    // One call per score row (the same stream, in the same order) so rows can be padded apart.
    for (let k = 0; k < scoresPerSample; k++)
      fillNormalScores(stream, scratch.independent, k * (count + ROW_PADDING), count)
    // Parameter scores come after every other row, so plans without them draw exactly as before.
    if (uncertain) drawParameterScores(stream, count)
    scratch.basisSum.fill(0)
    scratch.basisCross.fill(0)
    scratch.valueSum.fill(0)
    scratch.valueCross.fill(0)
    for (let tileStart = 0; tileStart < count; tileStart += TILE) {
      const tileCount = Math.min(TILE, count - tileStart)
      scoreTile(plan, tables, scratch, count, tileStart, tileCount)
      valueTile(plan, tables, scratch, tileCount)
      if (scratch.sumsAreLevels) basisFromValues(plan, tables, scratch, tileCount)
      sumTile(plan, tables, scratch, tileCount)
      const weights = weighted ? weighTile(plan, scratch, tileCount, partial) : null
      scratch.weights = weights
      for (const pair of tables.yearPairs) countYearPair(plan, tables, scratch, pair, tileCount, partial)
      for (let t = 0; t < yearCount; t++) {
        if (tables.pairedYear[t]) continue
        if (tables.constantYear[t]) {
          countConstantYear(plan, tables, scratch, t, tileCount, partial)
          continue
        }
        riseOfYear(plan, tables, scratch, t, tileCount)
        countYear(plan, tables, scratch, t, tileCount, partial)
      }
      if (plan.trigger !== null) {
        triggerTile(
          plan,
          scratch,
          tileCount,
          partial.triggerCounts,
          weights && { weights, into: partial.weighted, at: plan.observations!.triggerAt },
        )
      }
      if (uncertain) tileParameters(plan, count, tileStart, tileCount)
      if (plan.trigger?.floodHeights.length)
        floodAnnualTile(plan, tileCount, partial.blockSums, b * plan.sumsPerBlock)
      if (plan.gumbel !== null)
        gumbelTile(plan, tables, scratch, tileCount, partial.blockSums, b * plan.sumsPerBlock, partial.lifeHistogram)
      if (weighted) addWeightedTile(plan, tables, scratch, tileCount, partial)
    }
    blockSumsByYear(plan, scratch, partial.blockSums, b * plan.sumsPerBlock)
    partial.samples += count
  }
  finishCounts(plan, tables, scratch, partial)
  if (weighted) finishWeightedCells(plan, partial)
  // The scratch outlives the call; the partial's sums must not be written through it again.
  scratch.weights = null
  scratch.weighted = NO_SUMS
  // Views of what was used; the whole buffers still travel (transferred, not copied) between threads.
  partial.blocks = partial.blocks.subarray(0, done)
  partial.blockSums = partial.blockSums.subarray(0, done * plan.sumsPerBlock)
  return partial
}
