import { planOutlook } from './plan'
import { blockStreamState } from './rng'
import { samplerTables } from './sampler-tables'
import { basisFromValues } from './tile-sums'
import { ROW, ROW_PADDING, TILE, tileScratch } from './tile-scratch'
import { scoreTile, valueTile } from './tile-values'
import type { OutlookPlan } from './types'
import { fillNormalScores } from './ziggurat'

// Annual rise along individual trajectories of an outlook. The sample loop only counts (histograms,
// exceedances, sums) and keeps no trajectory; questions about a trajectory's own path (when does this
// future tip, what would a gauge have shown by then) need the path itself. This draws the outlook's
// first samples again with the sample loop's own steps (same seed, blocks, stream order, scores and
// basis values), so trajectory i here is sample i of the outlook, and forms each year's rise from the
// knots of the annual trigger plan: the rise is linear in time between knots (see `planTriggers`).

/** Trajectories are held in memory (count × years values): enough for rates of a few per cent. */
export const MAX_TRAJECTORIES = 20_000

export interface Trajectories {
  /** The outlook's baseline year: year index 0, where every rise is zero. */
  firstYear: number
  /** Years firstYear … firstYear + yearCount − 1 (to the outlook's last output year). */
  yearCount: number
  count: number
  /** Rise in metres above mean sea level at the baseline year, trajectory i's year y at [i·yearCount + y]. */
  rise: Float64Array
}

/**
 * The outlook's own plan with one mean-sea-level threshold, so it carries the knots of annual trigger
 * counting. Thresholds and extreme-water statistics do not change the draws: their rows come after
 * every score row (or are not drawn at all), so the samples are the outlook's.
 */
export function planTrajectories(outlookInput: Record<string, unknown>): OutlookPlan {
  return planOutlook({
    ...outlookInput,
    thresholds: [{ key: 'trajectory', height: 0, kind: 'mean-sea-level' }],
    gumbel: undefined,
  })
}

/** The first `count` samples of the planned outlook, year by year (`count` at most the outlook's samples). */
export function sampleTrajectories(plan: OutlookPlan, count: number): Trajectories {
  const trigger = plan.trigger
  if (!trigger) throw new RangeError('Plan trajectories with planTrajectories: the plan needs its trigger knots.')
  if (!Number.isInteger(count) || count < 1 || count > Math.min(plan.samples, MAX_TRAJECTORIES))
    throw new RangeError(`Ask for 1 to ${Math.min(plan.samples, MAX_TRAJECTORIES)} trajectories of this outlook.`)
  const { yearCount, knotYears } = trigger
  const knotCount = knotYears.length
  const rise = new Float64Array(count * yearCount)
  // Each knot's rise for the tile's samples at [k·TILE + i]; knot 0 (the baseline year) stays zero.
  const knotRise = new Float64Array(knotCount * TILE)
  const tables = samplerTables(plan)
  const scratch = tileScratch(plan)
  scratch.sumsAreLevels = tables.hasDraws
  scratch.sumsAt = tables.hasDraws ? scratch.levelsAt : scratch.basisAt
  const intercepts = scratch.sumsAreLevels ? trigger.knotLandIntercept : trigger.knotCenter
  const scoreRows = plan.componentKeys.length + 1
  const rows = scratch.rows
  const blocks = Math.ceil(count / plan.blockSize)
  for (let block = 0; block < blocks; block++) {
    // The block is drawn whole (its stream gives every row in full), then only the wanted samples are kept.
    const blockCount = Math.min(plan.blockSize, plan.samples - block * plan.blockSize)
    const stream = blockStreamState(plan.seed, block)
    for (let k = 0; k < scoreRows; k++)
      fillNormalScores(stream, scratch.independent, k * (blockCount + ROW_PADDING), blockCount)
    for (let tileStart = 0; tileStart < blockCount; tileStart += TILE) {
      const first = block * plan.blockSize + tileStart
      if (first >= count) break
      const tileCount = Math.min(TILE, blockCount - tileStart, count - first)
      scoreTile(plan, tables, scratch, blockCount, tileStart, tileCount)
      valueTile(plan, tables, scratch, tileCount)
      if (scratch.sumsAreLevels) basisFromValues(plan, tables, scratch, tileCount)
      for (let k = 1; k < knotCount; k++) {
        const out = k * TILE
        knotRise.fill(intercepts[k]!, out, out + tileCount)
        for (let c = trigger.knotColumnStart[k]!; c < trigger.knotColumnStart[k + 1]!; c++) {
          const weight = trigger.knotColumnWeight[c]!
          if (weight === 0) continue
          const at = scratch.sumsAt + trigger.knotColumns[c]! * ROW
          for (let i = 0; i < tileCount; i++) knotRise[out + i]! += weight * rows[at + i]!
        }
      }
      for (let i = 0; i < tileCount; i++) fillYears(rise, (first + i) * yearCount, knotYears, knotRise, i)
    }
  }
  return { firstYear: trigger.firstYear, yearCount, count, rise }
}

/** Linear between knots, for tile sample i; knot 0 is the baseline year, where the rise is zero. */
function fillYears(out: Float64Array, at: number, knotYears: Int32Array, knotRise: Float64Array, i: number): void {
  const firstYear = knotYears[0]!
  out[at] = 0
  let r0 = 0
  for (let k = 1; k < knotYears.length; k++) {
    const from = knotYears[k - 1]!
    const span = knotYears[k]! - from
    const r1 = knotRise[k * TILE + i]!
    const step = (r1 - r0) / span
    const base = at + from - firstYear
    for (let o = 1; o < span; o++) out[base + o] = r0 + step * o
    out[base + span] = r1
    r0 = r1
  }
}
