import type { OutlookResult } from '../engine'
import type { StaleFigure } from '../types/staleness'
import { formatChance } from '../wording/chance'
import type { Language } from '../wording/translate'

// The part of a briefing's staleness that its gauge section adds (server/services/briefing-staleness.ts
// does the rest): the section states chances updated by the site's gauge record, which a new record can
// change while the outlook's own numbers stay as they were.

type GaugeChange = Pick<StaleFigure, 'thresholdId' | 'kind' | 'year' | 'was' | 'now'>

/**
 * What the briefing's gauge section states and a newer outlook changes: each mean-sea-level chance updated
 * by the gauge record in the section's year (2100 where computed, else the last), when it reads
 * differently now or is no longer given; and, when the briefing gave no update (no record, or its record
 * was refused) but the latest outlook does, each updated chance as new: a record that now moves the
 * chances is news to the briefing's readers even though the outlook's own numbers stay as they were.
 */
export function gaugeUpdateChanges(
  was: OutlookResult,
  now: OutlookResult,
  language: Language,
): GaugeChange[] {
  const before = was.observationUpdate && !was.observationUpdate.refused ? was.observationUpdate : null
  const after = now.observationUpdate && !now.observationUpdate.refused ? now.observationUpdate : null
  const year = was.years.includes(2100) ? 2100 : was.years.at(-1)!
  const nowIndex = now.years.indexOf(year)
  if (!before) {
    if (!after || nowIndex < 0) return []
    return after.thresholds.flatMap((threshold): GaugeChange[] => {
      const found = threshold.byYear[nowIndex]?.value
      if (found == null) return []
      return [{ thresholdId: threshold.key, kind: 'gauge-update-new', year, was: null, now: found }]
    })
  }
  const wasIndex = was.years.indexOf(year)
  return before.thresholds.flatMap((threshold): GaugeChange[] => {
    const stated = threshold.byYear[wasIndex]?.value
    if (stated == null) return []
    const found = after?.thresholds.find(t => t.key === threshold.key)?.byYear[nowIndex]?.value
    if (found == null)
      return [{ thresholdId: threshold.key, kind: 'gauge-update-gone', year, was: stated, now: null }]
    if (formatChance(stated, language) === formatChance(found, language)) return []
    return [{ thresholdId: threshold.key, kind: 'gauge-updated', year, was: stated, now: found }]
  })
}
