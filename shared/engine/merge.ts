import type { OutlookPartial, OutlookPlan } from './types'
import { emptyPartial } from './run'
import { rescaleWeighted } from './tile-weights'

/**
 * Combines partials of any blocks, in any order and any split, as long as no block comes twice. Counts
 * add exactly; per-block sums are laid out by block index, so later totals are summed in block order
 * whatever the split was.
 */
export function mergePartials(plan: OutlookPlan, partials: OutlookPartial[]): OutlookPartial {
  if (!partials.length) throw new RangeError('nothing to merge: pass at least one partial')
  // Where each block's sums go in the merged partial: its rank among the blocks present.
  const position = new Int32Array(plan.blockCount).fill(-1)
  for (const partial of partials) {
    for (let k = 0; k < partial.blocks.length; k++) {
      const block = partial.blocks[k]!
      if (position[block] !== -1)
        throw new RangeError(`block ${block} comes in two partials: each block must be sampled once`)
      position[block] = 0
    }
  }
  let blockCount = 0
  for (let block = 0; block < plan.blockCount; block++) if (position[block] === 0) position[block] = blockCount++
  const merged = emptyPartial(plan, blockCount)
  for (let block = 0; block < plan.blockCount; block++)
    if (position[block] !== -1) merged.blocks[position[block]!] = block
  // The first partial is copied, the others added (this runs on the caller's thread after the last
  // worker answers, so it is on every pooled request's critical path).
  merged.cellCounts.set(partials[0]!.cellCounts)
  merged.histogram.set(partials[0]!.histogram)
  merged.lifeHistogram.set(partials[0]!.lifeHistogram)
  merged.triggerCounts.set(partials[0]!.triggerCounts)
  mergeWeighted(merged, partials)
  const size = plan.sumsPerBlock
  for (let p = 0; p < partials.length; p++) {
    const partial = partials[p]!
    merged.samples += partial.samples
    if (p > 0) {
      addCounts(merged.cellCounts, partial.cellCounts)
      addCounts(merged.histogram, partial.histogram)
      addCounts(merged.lifeHistogram, partial.lifeHistogram)
      // Difference counts are signed; their sums stay within ±2³¹ (at most two million samples).
      for (let i = 0; i < merged.triggerCounts.length; i++)
        merged.triggerCounts[i] = (merged.triggerCounts[i]! + partial.triggerCounts[i]!) | 0
    }
    for (let t = 0; t < merged.minimum.length; t++) {
      if (partial.minimum[t]! < merged.minimum[t]!) merged.minimum[t] = partial.minimum[t]!
      if (partial.maximum[t]! > merged.maximum[t]!) merged.maximum[t] = partial.maximum[t]!
    }
    for (let k = 0; k < partial.blocks.length; k++) {
      merged.blockSums.set(partial.blockSums.subarray(k * size, (k + 1) * size), position[partial.blocks[k]!]! * size)
    }
  }
  return merged
}

function addCounts(into: Uint32Array, from: Uint32Array): void {
  for (let i = 0; i < into.length; i++) into[i] = (into[i]! + from[i]!) >>> 0
}

/**
 * Weighted sums of several partials, each kept relative to its own largest log-likelihood: all are
 * brought to the largest of those scales and added, so the merge is associative up to rounding.
 */
function mergeWeighted(merged: OutlookPartial, partials: OutlookPartial[]): void {
  if (!merged.weighted.length) return
  let scale = -Infinity
  for (const partial of partials) if (partial.weightScale > scale) scale = partial.weightScale
  merged.weightScale = scale
  if (scale === -Infinity) return
  const into = merged.weighted
  const rescaled = new Float64Array(into.length)
  for (const partial of partials) {
    rescaled.set(partial.weighted)
    rescaleWeighted(rescaled, partial.weightScale, scale)
    for (let k = 0; k < into.length; k++) into[k] = into[k]! + rescaled[k]!
  }
}
