import { annualExceedance, factoredExceedance, lifeLogSum, lifeNoExceedance } from './flood-chance'
import { TILE_PARAMETERS } from './gumbel-uncertainty'
import { PASS, SLOTS_PER_PASS, type SamplerTables } from './sampler-tables'
import { ROW, TILE, type TileScratch } from './tile-scratch'
import type { OutlookPlan } from './types'

// The float sums of a tile and of a block: moments, variance-share sums and the Gumbel statistics.
// Their order of addition is fixed by the tile and block split, which keeps them reproducible.

/** Per tile sample, e^{(rise − center)/λ} of the year at hand (a module array, like `CELLS` in `tile-counts.ts`). */
const GROWTH = new Float64Array(TILE)

/**
 * The centred basis when the value loop summed levels: per column, the sum of its slots' centred values,
 * in slot order, three per pass (padding reads the zero row of `values`); land motion's is its score.
 */
export function basisFromValues(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  tileCount: number,
): void {
  // Values and basis are rows of the same array (see `TileScratch.rows`).
  const values = scratch.rows
  const basis = values
  const landColumn = plan.basisCount - 1
  for (let j = 0; j < landColumn; j++) {
    const slots = tables.columnSlots[j]!
    const at = scratch.basisAt + j * ROW
    for (let p = 0; p < slots.length; p += SLOTS_PER_PASS) {
      const v0 = scratch.valuesAt + slots[p]! * ROW
      const v1 = scratch.valuesAt + slots[p + 1]! * ROW
      const v2 = scratch.valuesAt + slots[p + 2]! * ROW
      if (p === 0)
        for (let i = 0; i < tileCount; i++) basis[at + i] = values[v0 + i]! + values[v1 + i]! + values[v2 + i]!
      else
        for (let i = 0; i < tileCount; i++)
          basis[at + i] = basis[at + i]! + values[v0 + i]! + values[v1 + i]! + values[v2 + i]!
    }
  }
}

/**
 * Dot products over the tile: everything the moments and variance shares of every year need. Four
 * columns per pass, each with its own accumulator, so the sums do not wait on one another.
 */
export function sumTile(plan: OutlookPlan, tables: SamplerTables, scratch: TileScratch, tileCount: number): void {
  const columnCount = plan.basisCount
  const landColumn = columnCount - 1
  const rowCount = 1 + plan.valueCount
  // Values and basis are rows of the same array (see `TileScratch.rows`).
  const values = scratch.rows
  const basis = values
  const { valuesAt, basisAt } = scratch
  const columns = tables.allColumns
  // Rows are the land-motion column, then the anchor-value slots; two rows per pass share the column
  // loads. A component column's own row is the sum of its slots' rows (`basisRowsFromValues`).
  // Index sums are `| 0` so they carry no overflow checks (see `countOnePass`).
  for (let row = 0; row < rowCount; row += 2) {
    const second = Math.min(row + 1, rowCount - 1)
    const sourceA = row === 0 ? basis : values
    const sourceB = second === 0 ? basis : values
    const atA = row === 0 ? basisAt + landColumn * ROW : valuesAt + (row - 1) * ROW
    const atB = second === 0 ? basisAt + landColumn * ROW : valuesAt + (second - 1) * ROW
    let sumA = 0
    let sumB = 0
    for (let p = 0; p < columns.length; p += PASS) {
      const b0 = basisAt + columns[p]! * ROW
      const b1 = basisAt + columns[p + 1]! * ROW
      const b2 = basisAt + columns[p + 2]! * ROW
      const b3 = basisAt + columns[p + 3]! * ROW
      let a0 = 0
      let a1 = 0
      let a2 = 0
      let a3 = 0
      let c0 = 0
      let c1 = 0
      let c2 = 0
      let c3 = 0
      if (p === 0) {
        for (let i = 0; i < tileCount; i = (i + 1) | 0) {
          const x = sourceA[(atA + i) | 0]!
          const y = sourceB[(atB + i) | 0]!
          const u0 = basis[(b0 + i) | 0]!
          const u1 = basis[(b1 + i) | 0]!
          const u2 = basis[(b2 + i) | 0]!
          const u3 = basis[(b3 + i) | 0]!
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
      }
      else {
        for (let i = 0; i < tileCount; i = (i + 1) | 0) {
          const x = sourceA[(atA + i) | 0]!
          const y = sourceB[(atB + i) | 0]!
          const u0 = basis[(b0 + i) | 0]!
          const u1 = basis[(b1 + i) | 0]!
          const u2 = basis[(b2 + i) | 0]!
          const u3 = basis[(b3 + i) | 0]!
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

/**
 * Adds one pass's dot products of a row (0: land motion's basis column, r ≥ 1: value slot r − 1);
 * padding columns point at the zero row and are not stored.
 */
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
  const target = row === 0 ? scratch.basisCross : scratch.valueCross
  const at = (row === 0 ? columnCount - 1 : row - 1) * columnCount
  if (columns[p]! < columnCount) target[at + columns[p]!]! += c0
  if (columns[p + 1]! < columnCount) target[at + columns[p + 1]!]! += c1
  if (columns[p + 2]! < columnCount) target[at + columns[p + 2]!]! += c2
  if (columns[p + 3]! < columnCount) target[at + columns[p + 3]!]! += c3
}

function addSum(scratch: TileScratch, columnCount: number, row: number, sum: number): void {
  if (row === 0) scratch.basisSum[columnCount - 1]! += sum
  else scratch.valueSum[row - 1]! += sum
}

/**
 * A component column's basis value is the sum of its slots' centred values, so its sums and dot
 * products are the sums of theirs (in slot order): the sample loop forms only the slots' and land
 * motion's, and the shares' parts add up to the total's variance by construction.
 */
function basisRowsFromValues(plan: OutlookPlan, scratch: TileScratch): void {
  const columnCount = plan.basisCount
  const { basisSum, basisCross, valueSum, valueCross } = scratch
  basisSum.fill(0, 0, columnCount - 1)
  basisCross.fill(0, 0, (columnCount - 1) * columnCount)
  for (let slot = 0; slot < plan.valueCount; slot++) {
    const j = plan.valueBasis[slot]!
    basisSum[j]! += valueSum[slot]!
    for (let k = 0; k < columnCount; k++) basisCross[j * columnCount + k]! += valueCross[slot * columnCount + k]!
  }
}

/**
 * A block's basis sums → its per-year sums. With x̃ an anchor value less its all-scores-zero value,
 * dev(t) = Σ_j w_tj·basis_j and a part's deviation p̃_c(t) = Σ_a w_t,j(a)·x̃_a: Σdev = Σ_j w_tj Σbasis_j,
 * Σdev² = Σ_jk w_tj w_tk Σbasis_j·basis_k, Σp̃·dev = Σ_a w_t,j(a) Σ_k w_tk Σx̃_a·basis_k. Land motion's
 * deviation is slope·score, its score being the last basis column.
 */
export function blockSumsByYear(plan: OutlookPlan, scratch: TileScratch, sums: Float64Array, sumOffset: number): void {
  const columnCount = plan.basisCount
  const landColumn = columnCount - 1
  const componentCount = plan.componentKeys.length
  const partCount = componentCount + 1
  basisRowsFromValues(plan, scratch)
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

/**
 * Annual chances and expected exceedances of every Gumbel level in year t with each sample's own
 * location and scale (`TILE_PARAMETERS`): chance −expm1(−e^e), expected e^e, e = (rise + μ_s − level)/λ_s.
 */
function uncertainLevels(
  plan: OutlookPlan,
  t: number,
  tileCount: number,
  rise: Float64Array,
  sums: Float64Array,
  sumOffset: number,
): void {
  const gumbel = plan.gumbel!
  const levels = gumbel.levels
  const riseAt = t * ROW
  const parameters = TILE_PARAMETERS
  const chanceAt = sumOffset + plan.sumLayout.annualChance
  const expectedAt = sumOffset + plan.sumLayout.expectedCount
  for (let k = 0; k < levels.length; k++) {
    const level = levels[k]!
    const reference = gumbel.levelReference[t * levels.length + k]!
    let deviations = 0
    let squares = 0
    let expected = 0
    for (let i = 0; i < tileCount; i++) {
      const rate = Math.exp((rise[riseAt + i]! + parameters[i]! - level) * parameters[TILE + i]!)
      const deviation = -Math.expm1(-rate) - reference
      deviations += deviation
      squares += deviation * deviation
      expected += rate
    }
    const at = chanceAt + 2 * (t * levels.length + k)
    sums[at]! += deviations
    sums[at + 1]! += squares
    sums[expectedAt + t * levels.length + k]! += expected
  }
}

/**
 * Life chances with each sample's own parameters: ln Σ_years e^{rise/λ_s}, each life threshold's chance
 * of no exceedance, and the chance of none at every height of the span's grid (for the design-life level).
 */
function uncertainLife(
  plan: OutlookPlan,
  tables: SamplerTables,
  tileCount: number,
  rise: Float64Array,
  sums: Float64Array,
  sumOffset: number,
): void {
  const gumbel = plan.gumbel!
  const grids = gumbel.uncertainty!.lifeGrid
  const parameters = TILE_PARAMETERS
  const lifeAt = sumOffset + plan.sumLayout.lifeNoExceedance
  const gridAt = sumOffset + plan.sumLayout.lifeGrid
  for (let s = 0; s < tables.lifeSegments.length; s++) {
    const segments = tables.lifeSegments[s]!
    const members = tables.lifeThresholds[s]!
    const grid = grids[s]!
    const at = gridAt + s * grid.length
    for (let i = 0; i < tileCount; i++) {
      const location = parameters[i]!
      const inverseScale = parameters[TILE + i]!
      const logSum = lifeLogSum(segments, rise, ROW, i, inverseScale)
      for (let m = 0; m < members.length; m++) {
        const threshold = plan.thresholds[members[m]!]!
        const deviation = lifeNoExceedance(logSum, threshold.height - location, inverseScale) - threshold.lifeReference!
        const sumAt = lifeAt + 2 * threshold.lifeSumIndex!
        sums[sumAt]! += deviation
        sums[sumAt + 1]! += deviation * deviation
      }
      for (let g = 0; g < grid.length; g++) sums[at + g]! += lifeNoExceedance(logSum, grid[g]! - location, inverseScale)
    }
  }
}

/** Σg, Σ(g − 1) and Σ(g − 1)² of the capped growth (`cappedGrowthSums`). */
const CAPPED = new Float64Array(3)

/**
 * A year whose rise has a lognormal part felt with a positive weight (see `HeavyTail`): the allowance's
 * sums over the growth with each such part held at its cap when past it. Only the rare samples past a
 * cap (0.1 % per part) differ from `growth`, which keeps the uncapped value for the chances.
 */
function cappedGrowthSums(
  plan: OutlookPlan,
  scratch: TileScratch,
  t: number,
  tileCount: number,
  growth: Float64Array,
  inverseScale: number,
): Float64Array {
  const heavy = plan.gumbel!.heavy
  const slotCount = heavy.slots.length
  const values = scratch.rows
  let sum = 0
  let deviations = 0
  let squares = 0
  for (let i = 0; i < tileCount; i++) {
    let excess = 0
    for (let h = 0; h < slotCount; h++) {
      // Past the cap when the value is beyond it on the side its scale grows to.
      const over = heavy.sign[h]! * (values[scratch.valuesAt + heavy.slots[h]! * ROW + i]! - heavy.cap[h]!)
      if (over > 0) excess -= heavy.weight[t * slotCount + h]! * heavy.sign[h]! * over
    }
    const value = excess === 0 ? growth[i]! : growth[i]! * Math.exp(excess * inverseScale)
    sum += value
    const deviation = value - 1
    deviations += deviation
    squares += deviation * deviation
  }
  CAPPED[0] = sum
  CAPPED[1] = deviations
  CAPPED[2] = squares
  return CAPPED
}

/**
 * The Gumbel sums of a tile: Σ exp((rise − center)/λ) per year; per year and Gumbel level the annual
 * chance of exceeding it, as deviations from the reference chance and their squares (their spread gives
 * the standard error of the mean chance); per life span each sample's ln Σ_years e^{rise/λ}, counted in
 * the span's histogram and turned into each of its thresholds' chance of no exceedance in the life.
 */
export function gumbelTile(
  plan: OutlookPlan,
  tables: SamplerTables,
  scratch: TileScratch,
  tileCount: number,
  sums: Float64Array,
  sumOffset: number,
  lifeHistogram: Uint32Array,
): void {
  const gumbel = plan.gumbel!
  const inverseScale = 1 / gumbel.scale
  const yearCount = plan.years.length
  const rise = scratch.rise
  const expAt = sumOffset + plan.sumLayout.gumbelExp
  const chanceAt = sumOffset + plan.sumLayout.annualChance
  const levels = gumbel.levels
  const growth = GROWTH
  const heavy = gumbel.heavy
  const growthAt = sumOffset + plan.sumLayout.gumbelGrowth
  for (let t = 0; t < yearCount; t++) {
    const riseAt = t * ROW
    const center = plan.center[t]!
    let sum = 0
    let deviations = 0
    let squares = 0
    for (let i = 0; i < tileCount; i++) {
      const value = Math.exp((rise[riseAt + i]! - center) * inverseScale)
      growth[i] = value
      sum += value
      const deviation = value - 1
      deviations += deviation
      squares += deviation * deviation
    }
    if (heavy.unsettled[t] === 1) {
      const capped = cappedGrowthSums(plan, scratch, t, tileCount, growth, inverseScale)
      sum = capped[0]!
      deviations = capped[1]!
      squares = capped[2]!
    }
    sums[expAt + t]! += sum
    sums[growthAt + 2 * t]! += deviations
    sums[growthAt + 2 * t + 1]! += squares
    if (gumbel.uncertainty !== null) {
      uncertainLevels(plan, t, tileCount, rise, sums, sumOffset)
      continue
    }
    for (let k = 0; k < levels.length; k++) {
      const factor = gumbel.levelFactor[t * levels.length + k]!
      const reference = gumbel.levelReference[t * levels.length + k]!
      let deviations = 0
      let squares = 0
      if (factor > 0) {
        for (let i = 0; i < tileCount; i++) {
          const deviation = factoredExceedance(growth[i]!, factor) - reference
          deviations += deviation
          squares += deviation * deviation
        }
      }
      else {
        const shift = levels[k]! - gumbel.location
        for (let i = 0; i < tileCount; i++) {
          const deviation = annualExceedance(rise[riseAt + i]!, shift, inverseScale) - reference
          deviations += deviation
          squares += deviation * deviation
        }
      }
      const at = chanceAt + 2 * (t * levels.length + k)
      sums[at]! += deviations
      sums[at + 1]! += squares
    }
  }
  const lifeAt = sumOffset + plan.sumLayout.lifeNoExceedance
  if (gumbel.uncertainty !== null) {
    uncertainLife(plan, tables, tileCount, rise, sums, sumOffset)
    return
  }
  for (let s = 0; s < tables.lifeSegments.length; s++) {
    const segments = tables.lifeSegments[s]!
    const span = plan.lifeSpans[s]!
    const members = tables.lifeThresholds[s]!
    const inverseWidth = 1 / span.width
    // Cell k holds values within half a width of origin + (firstBin + k − 1)·width (see `LifeSpan`).
    const cellShift = 1.5 - span.firstBin
    const lastCell = span.bins + 1
    for (let i = 0; i < tileCount; i++) {
      const logSum = lifeLogSum(segments, rise, ROW, i, inverseScale)
      let cell = (logSum - span.origin) * inverseWidth + cellShift
      cell = cell < 0 ? 0 : cell > lastCell ? lastCell : cell | 0
      lifeHistogram[span.histogramOffset + cell]!++
      for (let m = 0; m < members.length; m++) {
        const threshold = plan.thresholds[members[m]!]!
        const deviation
          = lifeNoExceedance(logSum, threshold.height - gumbel.location, inverseScale) - threshold.lifeReference!
        const at = lifeAt + 2 * threshold.lifeSumIndex!
        sums[at]! += deviation
        sums[at + 1]! += deviation * deviation
      }
    }
  }
}
