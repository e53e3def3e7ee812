import type { ObservationUpdate, OutlookResult } from '../engine'
import { updateSectionYear } from '../observations/update-year'
import type { StaleFigure } from '../types/staleness'
import { formatChance } from '../wording/chance'
import type { Language } from '../wording/translate'

// The part of a briefing's staleness that its gauge section adds (server/services/briefing-staleness.ts
// does the rest): the section states chances updated by the site's gauge record, which a new record can
// change while the outlook's own numbers stay as they were.

type GaugeChange = Pick<StaleFigure, 'thresholdId' | 'kind' | 'year' | 'was' | 'now'>

/**
 * What the briefing's gauge section states and a newer outlook changes: each mean-sea-level chance updated
 * by the gauge record in the section's year (`updateSectionYear`), when it reads
 * differently now or is no longer given; and, when the briefing gave no update (no record, or its record
 * was refused) but the latest outlook does, each updated chance as new: a record that now moves the
 * chances is news to the briefing's readers even though the outlook's own numbers stay as they were.
 */
export function gaugeUpdateChanges(
  was: OutlookResult,
  now: OutlookResult,
  language: Language,
): GaugeChange[] {
  const after = now.observationUpdate && !now.observationUpdate.refused ? now.observationUpdate : null
  const sectionYear = updateSectionYear(was.observationUpdate, was.baselineYear)
  if (sectionYear === null) {
    // The briefing gave no updated numbers: new ones are news in the year the new section would state.
    const year = updateSectionYear(now.observationUpdate, now.baselineYear)
    const nowIndex = year === null ? -1 : now.years.indexOf(year)
    if (!after || year === null || nowIndex < 0) return []
    return after.thresholds.flatMap((threshold): GaugeChange[] => {
      const found = threshold.byYear[nowIndex]?.value
      if (found == null) return []
      return [{ thresholdId: threshold.key, kind: 'gauge-update-new', year, was: null, now: found }]
    })
  }
  const before = was.observationUpdate as ObservationUpdate & { refused: false }
  const year = sectionYear
  const wasIndex = was.years.indexOf(year)
  const nowIndex = now.years.indexOf(year)
  // A year the new record no longer reaches has no updated number of its own (it is the outlook's).
  const reached = after !== null && (after.byYear[nowIndex]?.carried ?? 0) > 0
  return before.thresholds.flatMap((threshold): GaugeChange[] => {
    const stated = threshold.byYear[wasIndex]?.value
    if (stated == null) return []
    const found = reached ? after.thresholds.find(t => t.key === threshold.key)?.byYear[nowIndex]?.value : null
    if (found == null)
      return [{ thresholdId: threshold.key, kind: 'gauge-update-gone', year, was: stated, now: null }]
    if (formatChance(stated, language) === formatChance(found, language)) return []
    return [{ thresholdId: threshold.key, kind: 'gauge-updated', year, was: stated, now: found }]
  })
}
