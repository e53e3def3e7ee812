import type { ObservationPlan } from './types'

// How far ahead an observed record is read. The weighting itself carries what the record says about
// the early years to every later year: each release's contribution keeps its place in its distribution
// from year to year, so trajectories that match a few decades at one gauge are taken to be the ones
// that match the ice sheets' behaviour late in the century too. That is the sampling's assumption, not
// something the record shows. So, by default, the update is read in full up to the record's last value
// and tapers linearly to nothing once as many years again have passed as the record spans (a fitted
// record is not read further ahead than its own length: common practice for extrapolating a fitted
// series); in between, each updated number blends the weighted and the outlook's own distributions in
// proportion. `whole-outlook` carries the record in full to every year (the weighting's own checks).

export type RecordReachMode = 'record-length' | 'whole-outlook'

export interface RecordReach {
  mode: RecordReachMode
  /** The update is the weighted one up to this time (the record's last value). */
  fullUntil: number
  /** From this time on the update is the outlook's own (null: never, `whole-outlook`). */
  noneFrom: number | null
}

export function recordReach(observations: Pick<ObservationPlan, 'firstTime' | 'lastTime' | 'reach'>): RecordReach {
  const { firstTime, lastTime, reach } = observations
  if (reach === 'whole-outlook') return { mode: reach, fullUntil: lastTime, noneFrom: null }
  return { mode: reach, fullUntil: lastTime, noneFrom: lastTime + (lastTime - firstTime) }
}

/** The share of the record's information an updated number carries in `year` (1 in full, 0 none). */
export function carriedShare(reach: RecordReach, year: number): number {
  if (reach.noneFrom === null || year <= reach.fullUntil) return 1
  if (year >= reach.noneFrom) return 0
  return (reach.noneFrom - year) / (reach.noneFrom - reach.fullUntil)
}

/**
 * Kish's effective sample size of the blend: sample i weighs c·wᵢ/Σw + (1 − c)/N, so
 * Σ(weight²) = c²/ESS + (2c(1 − c) + (1 − c)²)/N = c²/ESS + (1 − c²)/N.
 */
export function blendedEffectiveSize(ess: number, samples: number, carried: number): number {
  return 1 / ((carried * carried) / ess + (1 - carried * carried) / samples)
}
