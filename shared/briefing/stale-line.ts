import type { StaleFigure } from '../types/staleness'
import { formatChance } from '../wording/chance'
import { translator, type Language } from '../wording/translate'

// The e-mail's line for one figure of an issued briefing that newer outlooks changed
// (server/services/briefing-staleness.ts sends it; the pages word the same figures in
// components/briefing/BriefingStaleNotice.vue).

const STALE_WHAT = {
  'mean-sea-level': 'meanSeaLevel',
  'flood-level': 'flood',
  'gauge-updated': 'gaugeUpdated',
  'gauge-update-gone': 'gaugeUpdated',
  'gauge-update-new': 'gaugeUpdated',
} as const satisfies Record<StaleFigure['kind'], string>

/** One line per changed figure, in the briefing's language: "19 % now, 4 % in this briefing". */
export function staleLine(change: StaleFigure, language: Language) {
  const t = translator(language)
  const what = t(`emails.briefingStale.${STALE_WHAT[change.kind]}`, { threshold: change.threshold, year: change.year })
  const line = change.now === null ? 'lineGone' : change.was === null ? 'lineNew' : 'line'
  return t(`emails.briefingStale.${line}`, {
    scenario: change.scenario,
    what,
    now: change.now === null ? '' : formatChance(change.now, language),
    was: change.was === null ? '' : formatChance(change.was, language),
  })
}
