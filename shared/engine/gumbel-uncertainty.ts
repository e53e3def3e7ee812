import { fillNormalScores } from './ziggurat'
import { TILE } from './tile-scratch'
import type { GumbelUncertainty, LifeSpan, OutlookPlan } from './types'

// Uncertain Gumbel parameters: each trajectory draws its own location and scale from the bivariate
// normal of the fit's estimates (see `GumbelUncertainty`), from two more scores per sample appended to
// the block's stream after land motion's, so an outlook without standard errors draws exactly as before.

/** A trajectory's scale is kept at or above this fraction of the central scale (a Gumbel scale must stay positive). */
export const SCALE_FLOOR = 0.1
/** Heights per life span at which the chance of no exceedance is summed for the design-life level. */
export const LIFE_GRID_POINTS = 96
/** Parameter ranges the life grids cover, in standard errors either side. */
const GRID_SPAN_SE = 6

export function planUncertainty(
  gumbel: { location: number, scale: number, locationSe?: number, scaleSe?: number, locationScaleCorrelation?: number },
  lifeSpans: LifeSpan[],
): GumbelUncertainty | null {
  const locationSe = gumbel.locationSe ?? 0
  const scaleSe = gumbel.scaleSe ?? 0
  if (!(locationSe > 0) && !(scaleSe > 0)) return null
  const { location, scale } = gumbel
  const scales = [Math.max(scale - GRID_SPAN_SE * scaleSe, SCALE_FLOOR * scale), scale + GRID_SPAN_SE * scaleSe]
  const lifeGrid = lifeSpans.map((span) => {
    // The span's histogram range bounds λ·(S − ln L) by the lowest and highest rise of the life.
    const lowRise = span.firstBin * span.width * scale
    const highRise = (span.firstBin + span.bins - 1) * span.width * scale
    // A sample's chance of none, exp(−e^{S − (h − μ)/λ}), is below e^{−e³} at or under `low` and above
    // 1 − 10⁻⁶ at or over `high`, for every parameter pair within GRID_SPAN_SE errors.
    const low = location - GRID_SPAN_SE * locationSe + Math.min(...scales.map(s => s * (span.origin - 3))) + lowRise
    const high = location + GRID_SPAN_SE * locationSe + Math.max(...scales.map(s => s * (span.origin + 14))) + highRise
    return Float64Array.from({ length: LIFE_GRID_POINTS }, (_, g) => low + ((high - low) * g) / (LIFE_GRID_POINTS - 1))
  })
  return { locationSe, scaleSe, correlation: gumbel.locationScaleCorrelation ?? 0, scaleFloor: SCALE_FLOOR, lifeGrid }
}

/** The block's two parameter score rows: [0, count) location, [count, 2·count) scale. */
let parameterScores = new Float64Array(0)
/** The tile's parameters: location at [i], 1 / scale at [TILE + i]. */
export const TILE_PARAMETERS = new Float64Array(2 * TILE)

/** Draws the block's parameter scores: call after every other score row of the block. */
export function drawParameterScores(stream: Uint32Array, count: number): void {
  if (parameterScores.length < 2 * count) parameterScores = new Float64Array(2 * count)
  fillNormalScores(stream, parameterScores, 0, count)
  fillNormalScores(stream, parameterScores, count, count)
}

/** Each tile sample's location and inverse scale into `TILE_PARAMETERS`. */
export function tileParameters(plan: OutlookPlan, count: number, tileStart: number, tileCount: number): void {
  const gumbel = plan.gumbel!
  const uncertainty = gumbel.uncertainty!
  const partner = Math.sqrt(Math.max(0, 1 - uncertainty.correlation * uncertainty.correlation))
  const floor = uncertainty.scaleFloor * gumbel.scale
  for (let i = 0; i < tileCount; i++) {
    const z1 = parameterScores[tileStart + i]!
    const z2 = parameterScores[count + tileStart + i]!
    const scale = gumbel.scale + uncertainty.scaleSe * (uncertainty.correlation * z1 + partner * z2)
    TILE_PARAMETERS[i] = gumbel.location + uncertainty.locationSe * z1
    TILE_PARAMETERS[TILE + i] = 1 / (scale > floor ? scale : floor)
  }
}
