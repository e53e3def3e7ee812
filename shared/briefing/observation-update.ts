import type { ObservationUpdate, OutlookResult } from '../engine'
import { formatHeight } from '../units'
import { beyondRange, formatChance } from '../wording/chance'
import { translator, type Language } from '../wording/translate'
import type { BriefingSource } from './document'
import { sayChance } from './findings'
import { readAheadYears, updateSectionYear } from '../observations/update-year'

// The briefing's section on the outlook updated by the site's gauge record (when the outlook was
// weighted by one): what changed for the likely range, the chances and the trigger years, then the
// method, its assumptions and its limits. Words in locales/<language>/document.json (observationDocument).

export interface BriefingObservationUpdate {
  title: string
  lines: string[]
  method: string[]
}

const TRIGGER_YEAR = (tolerance: number, years: { tolerance: number, year: number | null }[]) =>
  years.find(entry => Math.abs(entry.tolerance - tolerance) < 1e-9)?.year ?? null

function percentile(year: { percentiles: { level: number, value: number }[] }, level: number): number {
  return year.percentiles.find(p => Math.abs(p.level - level) < 1e-9)!.value
}

/**
 * How far ahead the record is read: in full to its last value, then less each year, none from the end of
 * its reach (or, for an update read to every year, that it is).
 */
function readAhead(update: ObservationUpdate & { refused: false }, language: Language): string {
  const t = translator(language)
  const { last, none } = readAheadYears(update)
  return none === null ? t('observationDocument.reachWhole') : t('observationDocument.reach', { last, none })
}

/** The section for the briefing's own outlook, or null when it was not weighted by a record. */
export function observationUpdateSection(
  source: BriefingSource,
  result: OutlookResult,
  tolerance: number,
): BriefingObservationUpdate | null {
  const update: ObservationUpdate | undefined = result.observationUpdate
  if (!update) return null
  const language = source.language
  const t = translator(language)
  const height = (metres: number) => formatHeight(metres, source.units, language)
  const count = (value: number) => Math.round(value).toLocaleString(language)
  const lastYear = result.years.at(-1)!
  const method = [
    t('observationDocument.method', {
      sd: formatHeight(update.residualSd, source.units, language, true),
      phi: update.phi.toLocaleString(language, { maximumFractionDigits: 2 }),
      minimum: update.minimumEss,
    }),
    t('observationDocument.assumptions'),
    t('observationDocument.limits'),
  ]
  const title = t('observationDocument.title')
  if (update.refused) {
    const refused = t('observationDocument.refused', {
      ess: count(update.ess),
      samples: count(result.samples),
      minimum: update.minimumEss,
    })
    return { title, lines: [refused], method }
  }
  const intro = t('observationDocument.intro', {
    count: update.observations,
    first: Math.floor(update.firstTime),
    last: Math.floor(update.lastTime),
    ess: count(update.ess),
    samples: count(result.samples),
  })
  const reach = readAhead(update, language)
  const year = updateSectionYear(update, result.baselineYear)
  if (year === null)
    return { title, lines: [intro, reach, t('observationDocument.outOfReach')], method }
  const at = result.years.indexOf(year)
  const plainYear = result.byYear[at]!
  const updatedYear = update.byYear[at]!
  const lines = [
    intro,
    reach,
    t('observationDocument.range', {
      year,
      low: height(percentile(plainYear, 0.17)),
      high: height(percentile(plainYear, 0.83)),
      updatedLow: height(percentile(updatedYear, 0.17)),
      updatedHigh: height(percentile(updatedYear, 0.83)),
    }),
  ]
  for (const updated of update.thresholds) {
    const plain = result.thresholds.find(th => th.key === updated.key)
    const threshold = source.thresholds.find(th => th.id === updated.key)
    if (!plain || !threshold) continue
    lines.push(
      t('observationDocument.chance', {
        threshold: threshold.label,
        height: height(threshold.height),
        year,
        chance: sayChance(plain.byYear[at]!, language).plain,
        updated: sayChance(updated.byYear[at]!, language).plain,
      }),
    )
    // A trigger year resting on a level beyond the releases says so, and so does its updated year: the
    // weights do not make the releases describe that tail.
    const beyond = plain.triggerYears.some(entry =>
      Math.abs(entry.tolerance - tolerance) < 1e-9 && entry.extrapolated === true)
    const say = (found: number | null) =>
      found === null
        ? t('observationDocument.notWithin', { year: lastYear })
        : beyond ? `${found} (${beyondRange(language)})` : String(found)
    lines.push(
      t('observationDocument.trigger', {
        threshold: threshold.label,
        tolerance: formatChance(tolerance, language),
        year: say(TRIGGER_YEAR(tolerance, plain.triggerYears)),
        updated: say(TRIGGER_YEAR(tolerance, updated.triggerYears)),
      }),
    )
  }
  return { title, lines, method }
}
