import { likelihoodWord, type LikelihoodKey } from '../engine'
import { formatHeight, type HeightUnit } from '../units'
import { translator, type Language } from './translate'

// Chances in plain words: the number first, then the calibrated IPCC word. Used by the outlook
// page and by briefings (page and PDF), in every language; the words are in locales/<language>/chance.json.

export type { Language }

/**
 * The IPCC's calibrated likelihood terms, in the reader's language (chance.likelihood.* in
 * locales/<language>/chance.json).
 */
export function likelihoodTerm(key: LikelihoodKey, language: Language): string {
  return translator(language)(`chance.likelihood.${key}`)
}

const EDGE = 0.01

/** "23 %", or "less than 1 %" / "more than 99 %" at the edges, where a rounded 0 or 100 would mislead. */
export function formatChance(probability: number, language: Language): string {
  if (probability < EDGE) return translator(language)('chance.lessThanOne')
  if (probability > 1 - EDGE) return translator(language)('chance.moreThan99')
  return `${Math.round(probability * 100)}\u00A0%`
}

/** A chance after Spanish "de": "del 23 %" (de + el), but "de menos del 1 %" where it has no article. */
export function chanceAfterDe(probability: number): string {
  const chance = formatChance(probability, 'es')
  return translator('es')(
    probability < EDGE || probability > 1 - EDGE ? 'chance.afterDe.edge' : 'chance.afterDe.plain',
    { chance },
  )
}

const SIMPLE_FRACTIONS: Array<[number, number]> = [[1, 2], [3, 5], [2, 3], [3, 4], [4, 5], [9, 10], [19, 20], [99, 100]]

/** "about a 1-in-4 chance" / "about 3 in 4": odds a council can picture. */
export function chanceAsOdds(probability: number, language: Language): string {
  const t = translator(language)
  if (probability < EDGE) return t('chance.odds.lessThan')
  if (probability > 1 - EDGE) return t('chance.odds.nearCertain')
  if (probability < 0.5) return t('chance.odds.oneIn', { n: Math.round(1 / probability) })
  const [k, n] = SIMPLE_FRACTIONS.reduce((best, f) =>
    Math.abs(f[0] / f[1] - probability) < Math.abs(best[0] / best[1] - probability) ? f : best,
  )
  return t('chance.odds.fraction', { k, n })
}

export function likelihoodPhrase(probability: number, language: Language): string {
  return likelihoodTerm(likelihoodWord(Math.min(1, Math.max(0, probability))), language)
}

/** Sampling error is worth a mention when it could move the rounded percentage. */
export function samplingNote(standardError: number, language: Language): string | null {
  if (2 * standardError < 0.005) return null
  const margin = `${(2 * standardError * 100).toLocaleString(language, { minimumFractionDigits: 1, maximumFractionDigits: 1 })}\u00A0%`
  return translator(language)('chance.samplingNote', { margin })
}

/**
 * Said instead of a calibrated word where a chance depends on a release beyond its outermost published
 * level: the release does not describe that tail, so no likelihood word is earned.
 */
export function beyondRange(language: Language): string {
  return translator(language)('chance.beyondRange')
}

/** The mark beside an extrapolated number in a table, and the note that explains it. */
// An asterisk: the briefing PDF's font has no dagger, and the mark must read the same on paper.
export const EXTRAPOLATED_MARK = '*'
export function extrapolatedNote(language: Language): string {
  return translator(language)('chance.extrapolatedNote')
}

export interface HeadlineParts {
  probability: number
  standardError: number
  /** The chance lies beyond the outermost level a release publishes: no calibrated word is given. */
  extrapolated?: boolean
  height: number
  year: number
  referenceLevel: string
  unit: HeightUnit
  language: Language
}

/**
 * "There is a 23 % chance (unlikely) that the mean sea level here will be more than 0.50 m above
 * <datum> by 2070." Only for mean-sea-level thresholds: a flood level is worded in wording/flood.ts.
 */
export function headlineSentence(parts: HeadlineParts): string {
  const { probability, language } = parts
  const word = parts.extrapolated ? beyondRange(language) : likelihoodPhrase(probability, language)
  const note = samplingNote(parts.standardError, language)
  return translator(language)('chance.headline', {
    ...chanceForms(probability, language), qualifier: note ? `(${word}; ${note})` : `(${word})`,
    height: formatHeight(parts.height, parts.unit, language), datum: parts.referenceLevel, year: parts.year,
  })
}

export interface SampledChance { value: number, se: number, upperBound95?: number, lowerBound95?: number }

const percentOf = (probability: number, language: Language) =>
  `${(probability * 100).toLocaleString(language, { maximumSignificantDigits: 2 })}\u00A0%`

/**
 * How sure the sampling is of a chance: its Monte Carlo standard error, or where no sample (or every
 * sample) reached the level, the one-sided 95 % bound of the rule of three instead of "0 ± 0".
 */
export function samplingPrecision(estimate: SampledChance, language: Language): string {
  const t = translator(language)
  if (estimate.upperBound95 !== undefined)
    return t('chance.precision.below', { bound: percentOf(estimate.upperBound95, language) })
  if (estimate.lowerBound95 !== undefined)
    return t('chance.precision.above', { bound: percentOf(estimate.lowerBound95, language) })
  return t('chance.precision.se', { se: percentOf(estimate.se, language) })
}

/** "a 23 % chance" but "an 18 % chance", "an 8 % chance", "an 80 % chance": the article a number is read with. */
export function aChance(probability: number): string {
  const chance = formatChance(probability, 'en')
  return /^(8|11|18)\b|^8\d\b/.test(chance.replace(/\u00A0/g, ' ')) ? `an ${chance}` : `a ${chance}`
}

/**
 * A chance in each form a sentence may need it: bare ("23 %"), after an English article ("an 18 %"),
 * after Spanish "de" ("del 23 %"). Each language's words take the one their grammar asks for.
 */
export function chanceForms(probability: number, language: Language) {
  return {
    chance: formatChance(probability, language),
    aChance: aChance(probability),
    chanceAfterDe: chanceAfterDe(probability),
  }
}
