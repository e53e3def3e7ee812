import { annualExceedance } from './flood-chance'
import { landRiseLine, type LandMotionLine } from './land-motion'
import { relativeAnchorWeights } from './timeline'
import type { TriggerPlan } from './types'
import type { ValidatedOutlookInput } from './validate'

/** Columns a knot's rise adds per pass over the tile. */
export const KNOT_PASS = 4

/**
 * What annual trigger years need. Along one trajectory every component is linear in time between its
 * release's baseline and anchor years, and land motion is linear throughout, so the rise is linear
 * between consecutive knots: the outlook's baseline, the output years, and every release's baseline and
 * anchor years in between. Each knot's rise is a fixed mix of the basis columns, like an output year's.
 *
 * `groups` lists, per basis column group (components sharing time weights), its first column and a
 * release with those weights; `valueBasis` and `valueAtZero` are the plan's. `floods` are the flood
 * levels whose annual chances are summed along the same knots (see `floodAnnualTile`).
 */
export function planTriggers(
  input: ValidatedOutlookInput,
  land: LandMotionLine,
  groups: Array<{ firstColumn: number, release: { baselineYear: number, anchorYears: number[] } }>,
  basisCount: number,
  valueBasis: Int32Array,
  valueAtZero: Float64Array,
  thresholdIndex: number[],
  heights: number[],
  floods: Array<{ index: number, height: number }> = [],
): TriggerPlan | null {
  if (!thresholdIndex.length && !floods.length) return null
  const baseline = input.baselineYear
  const last = input.years[input.years.length - 1]!
  const knotSet = new Set<number>([baseline, ...input.years])
  for (const component of input.components) {
    for (const year of [component.release.baselineYear, ...component.release.anchorYears]) {
      if (year > baseline && year < last) knotSet.add(year)
    }
  }
  const knotYears = Int32Array.from([...knotSet].sort((a, b) => a - b))
  const knotCount = knotYears.length
  const years = Array.from(knotYears)
  const knotWeight = new Float64Array(knotCount * basisCount)
  for (const group of groups) {
    const weights = relativeAnchorWeights(group.release.baselineYear, group.release.anchorYears, baseline, years)
    for (let k = 0; k < knotCount; k++) knotWeight.set(weights[k]!, k * basisCount + group.firstColumn)
  }
  const landIntercept = new Float64Array(knotCount)
  const landColumn = basisCount - 1
  for (let k = 0; k < knotCount; k++) {
    const elapsed = knotYears[k]! - baseline
    const rise = landRiseLine(land, elapsed)
    landIntercept[k] = input.landMotion ? rise.intercept : 0
    knotWeight[k * basisCount + landColumn] = input.landMotion ? rise.slope : 0
  }
  const center = Float64Array.from(landIntercept)
  for (let k = 0; k < knotCount; k++) {
    for (let slot = 0; slot < valueBasis.length; slot++)
      center[k]! += knotWeight[k * basisCount + valueBasis[slot]!]! * valueAtZero[slot]!
  }
  // Columns each knot reads (non-zero weights), flattened and padded to whole passes of four with the
  // zero row (column basisCount, weight 0): knot k's are columns[columnStart[k] … columnStart[k + 1]).
  const columns: number[] = []
  const columnWeights: number[] = []
  const columnStart = new Int32Array(knotCount + 1)
  for (let k = 0; k < knotCount; k++) {
    columnStart[k] = columns.length
    for (let j = 0; j < basisCount; j++) {
      if (knotWeight[k * basisCount + j] === 0) continue
      columns.push(j)
      columnWeights.push(knotWeight[k * basisCount + j]!)
    }
    while ((columns.length - columnStart[k]!) % KNOT_PASS !== 0 || columns.length === columnStart[k]) {
      columns.push(basisCount)
      columnWeights.push(0)
    }
  }
  columnStart[knotCount] = columns.length
  const yearCount = last - baseline + 1
  return {
    firstYear: baseline,
    yearCount,
    knotYears,
    knotIsOutput: Uint8Array.from(knotYears, year => (input.years.includes(year) ? 1 : 0)),
    knotWeight,
    knotColumns: Int32Array.from(columns),
    knotColumnWeight: Float64Array.from(columnWeights),
    knotColumnStart: columnStart,
    knotCenter: center,
    knotLandIntercept: landIntercept,
    thresholdIndex: Int32Array.from(thresholdIndex),
    heights: Float64Array.from(heights),
    floodIndex: Int32Array.from(floods, flood => flood.index),
    floodHeights: Float64Array.from(floods, flood => flood.height),
    floodReference: floodReference(input, knotYears, center, floods, yearCount),
  }
}

/** Each flood level's annual chance in each year along the all-scores-zero trajectory (central Gumbel). */
function floodReference(
  input: ValidatedOutlookInput,
  knotYears: Int32Array,
  center: Float64Array,
  floods: Array<{ height: number }>,
  yearCount: number,
): Float64Array {
  const reference = new Float64Array(floods.length * yearCount)
  const gumbel = input.gumbel
  if (!gumbel) return reference
  const centerRise = new Float64Array(yearCount)
  for (let k = 1; k < knotYears.length; k++) {
    const span = knotYears[k]! - knotYears[k - 1]!
    const at = knotYears[k - 1]! - knotYears[0]!
    for (let o = 1; o <= span; o++) centerRise[at + o] = center[k - 1]! + ((center[k]! - center[k - 1]!) * o) / span
  }
  floods.forEach((flood, m) => {
    for (let y = 0; y < yearCount; y++)
      reference[m * yearCount + y] = annualExceedance(centerRise[y]!, flood.height - gumbel.location, 1 / gumbel.scale)
  })
  return reference
}
