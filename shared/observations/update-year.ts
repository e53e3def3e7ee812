import type { ObservationUpdate } from '../engine'

// The year the gauge sections (outlook page, briefing, its staleness) state updated numbers for. The
// record is read only as far ahead as it reaches (shared/engine/observation-reach.ts): past that the
// updated numbers are the outlook's own, and a section showing them side by side would say nothing.

/**
 * The last output year after the baseline that the record still reaches (2100 or before when one is),
 * or null when the update was refused or every output year is out of its reach.
 */
export function updateSectionYear(update: ObservationUpdate | undefined, baselineYear: number): number | null {
  if (!update || update.refused) return null
  const reached = update.byYear
    .filter(year => year.carried > 0 && year.year > baselineYear)
    .map(year => year.year)
  if (!reached.length) return null
  const byCentury = reached.filter(year => year <= 2100)
  return byCentury.length ? Math.max(...byCentury) : Math.max(...reached)
}

/**
 * The years the reach sentence names: the last the record is read in full (its last value's year) and
 * the first it is not read at all; `none` is null when the record is read to every year.
 */
export function readAheadYears(update: ObservationUpdate & { refused: false }): { last: number, none: number | null } {
  const { fullUntil, noneFrom } = update.reach
  return { last: Math.floor(fullUntil), none: noneFrom === null ? null : Math.ceil(noneFrom) }
}
