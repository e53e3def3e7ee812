import { drawBreakpoints, drawRank, rankedIndices, type ComponentTable } from './releases'
import type { ParsedOutlookInput } from './schema'

// Land motion as the basis sees it: a rate in mm/yr that is a line in the land-motion column's value u,
// rate = interceptRate + slopeRate · u, entering the rise as −rate/1000 · (t − baseline).
//
// As a normal, u is the land-motion score: (rate, sigma). As posterior draws, u is the sample's draw less
// the draw at score zero (the all-scores-zero trajectory's), in mm/yr: (that draw, 1). Independent draws
// are picked by the land-motion score at rank ⌊Φ(z)·n⌋ exactly as a release's draws are; draws joint with
// a release take the same draw index as the release draw the sample picked.

export interface LandMotionLine {
  interceptRate: number
  slopeRate: number
}

export interface LandDrawPlan {
  /** Per rank, the land-motion column value u (the draw less the draw at score zero), mm/yr. */
  valueByRank: Float64Array
  /** Independent draws: Φ⁻¹(j/n), j = 1…n−1, the scores at which the rank steps up. */
  breakpoints: Float64Array
  /** The component whose ranked release draws the land draws follow, or −1 when independent. */
  linkedComponent: number
}

export interface PlannedLandMotion {
  line: LandMotionLine
  draws: LandDrawPlan | null
}

/** Rise of land motion in a year `elapsed` after the baseline: intercept + slope · u, in metres. */
export function landRiseLine(line: LandMotionLine, elapsed: number): { intercept: number, slope: number } {
  return { intercept: (-line.interceptRate / 1000) * elapsed, slope: (-line.slopeRate / 1000) * elapsed }
}

/** Mean land-motion rate in mm/yr: the rate of a normal, the mean of draws. */
export function meanLandRate(landMotion: { rateMmPerYear?: number, draws?: number[] } | undefined): number {
  if (!landMotion) return 0
  const draws = landMotion.draws
  if (!draws?.length) return landMotion.rateMmPerYear ?? 0
  let sum = 0
  for (const draw of draws) sum += draw
  return sum / draws.length
}

/**
 * The land-motion line and, for draws, the column value of each rank. `tables` are the components'
 * (validation has checked that a joint link names a draws release with as many draws).
 */
export function planLandMotion(
  landMotion: ParsedOutlookInput['landMotion'] | undefined,
  componentKeys: string[],
  tables: ComponentTable[],
): PlannedLandMotion {
  if (!landMotion) return { line: { interceptRate: 0, slopeRate: 0 }, draws: null }
  const draws = landMotion.draws
  if (!draws?.length)
    return { line: { interceptRate: landMotion.rateMmPerYear ?? 0, slopeRate: landMotion.sigmaMmPerYear }, draws: null }
  const linkedComponent = landMotion.jointWith === undefined ? -1 : componentKeys.indexOf(landMotion.jointWith)
  const order = linkedComponent < 0 ? rankedIndices(draws.length, i => draws[i]!) : tables[linkedComponent]!.drawOrder!
  const breakpoints = Float64Array.from(
    linkedComponent < 0 ? drawBreakpoints(draws.length) : tables[linkedComponent]!.breakpoints,
  )
  const center = draws[order[drawRank(breakpoints, 0, breakpoints.length, 0)]!]!
  return {
    line: { interceptRate: center, slopeRate: 1 },
    draws: {
      valueByRank: Float64Array.from(order, index => draws[index]! - center),
      breakpoints: linkedComponent < 0 ? breakpoints : new Float64Array(0),
      linkedComponent,
    },
  }
}
