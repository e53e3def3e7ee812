import type { OutlookPartial, OutlookPlan } from './types'
import { emptyPartial } from './run'

/**
 * Combines partials of consecutive block runs (any order, any split). Counts add exactly; per-block sums
 * are laid out by block index, so later totals are summed in block order whatever the split was.
 */
export function mergePartials(plan: OutlookPlan, partials: OutlookPartial[]): OutlookPartial {
  if (!partials.length) throw new RangeError('nothing to merge: pass at least one partial')
  const ordered = [...partials].sort((a, b) => a.firstBlock - b.firstBlock)
  for (let i = 1; i < ordered.length; i++) {
    const previous = ordered[i - 1]!
    if (previous.firstBlock + previous.blockCount !== ordered[i]!.firstBlock) {
      throw new RangeError(
        `partials must cover consecutive blocks: one ends at block ${previous.firstBlock + previous.blockCount - 1}, the next starts at ${ordered[i]!.firstBlock}`,
      )
    }
  }
  const first = ordered[0]!.firstBlock
  const blockCount = ordered.reduce((sum, partial) => sum + partial.blockCount, 0)
  const merged = emptyPartial(plan, first, blockCount)
  // The first partial is copied, the others added (this runs on the caller's thread after the last
  // worker answers, so it is on every pooled request's critical path).
  merged.cellCounts.set(ordered[0]!.cellCounts)
  merged.histogram.set(ordered[0]!.histogram)
  for (let p = 0; p < ordered.length; p++) {
    const partial = ordered[p]!
    merged.samples += partial.samples
    if (p > 0) {
      addCounts(merged.cellCounts, partial.cellCounts)
      addCounts(merged.histogram, partial.histogram)
    }
    for (let t = 0; t < merged.minimum.length; t++) {
      if (partial.minimum[t]! < merged.minimum[t]!) merged.minimum[t] = partial.minimum[t]!
      if (partial.maximum[t]! > merged.maximum[t]!) merged.maximum[t] = partial.maximum[t]!
    }
    merged.blockSums.set(partial.blockSums, (partial.firstBlock - first) * plan.sumsPerBlock)
  }
  return merged
}

function addCounts(into: Uint32Array, from: Uint32Array): void {
  for (let i = 0; i < into.length; i++) into[i] = (into[i]! + from[i]!) >>> 0
}
