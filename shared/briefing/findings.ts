import type { Estimate, ThresholdOutlook } from '../engine'
import { beyondRange, chanceAfterDe, formatChance, likelihoodPhrase, type Language } from '../wording/chance'
import type { BriefingText, ChanceSaid } from './text'

// The chance said once, one way: the number, then the calibrated word in brackets, or the mark that
// it lies beyond what the releases describe (an extrapolated chance earns no word). Spanish needs
// the number after "de" and after "a" too ("del 23 %", "al 23 %", "de menos del 1 %").

export function sayChance(estimate: Pick<Estimate, 'value' | 'extrapolated'>, language: Language): ChanceSaid {
  const p = estimate.value
  const word = `(${estimate.extrapolated ? beyondRange(language) : likelihoodPhrase(p, language)})`
  const plain = `${formatChance(p, language)} ${word}`
  if (language !== 'es') return { plain, afterDe: plain, afterA: plain }
  const afterDe = chanceAfterDe(p)
  return {
    plain,
    afterDe: `${afterDe} ${word}`,
    afterA: `${afterDe.replace(/^del /, 'al ').replace(/^de /, 'a ')} ${word}`,
  }
}

/**
 * The threshold a councillor hears about first: the lowest mean-sea-level threshold, since the sea
 * passes it first; a briefing of flood levels only leads with its first flood level.
 */
export function keyThreshold<T extends { id: string, kind?: string }>(
  thresholds: T[],
  found: (id: string) => ThresholdOutlook | undefined,
): T | undefined {
  const meanSea = thresholds.filter(t => t.kind !== 'flood-level' && found(t.id))
  if (meanSea.length) return meanSea.reduce((low, t) => (found(t.id)!.height < found(low.id)!.height ? t : low))
  return thresholds.find(t => found(t.id)?.flood)
}

/**
 * The chance that matters for a threshold in a year: passing it (mean sea level) or reaching it that year (flood
 * level).
 */
export function headlineEstimate(found: ThresholdOutlook | undefined, yearIndex: number): Estimate | undefined {
  if (!found || yearIndex < 0) return undefined
  return found.kind === 'flood-level' ? found.flood?.annualChance[yearIndex] : found.byYear[yearIndex]
}

/** "Across the 3 scenarios compared …": the lowest and highest of one chance over the scenarios. */
export function spreadSentence(
  chances: { scenario: string, estimate: Estimate }[],
  year: number,
  text: BriefingText,
  language: Language,
): string | null {
  if (chances.length < 2) return null
  const sorted = [...chances].sort((a, b) => a.estimate.value - b.estimate.value)
  const low = sorted[0]!
  const high = sorted.at(-1)!
  const same = formatChance(low.estimate.value, language) === formatChance(high.estimate.value, language)
  return same
    ? text.spreadSame(chances.length, year, sayChance(low.estimate, language))
    : text.spread(
        chances.length,
        year,
        { scenario: low.scenario, chance: sayChance(low.estimate, language) },
        { scenario: high.scenario, chance: sayChance(high.estimate, language) },
      )
}
