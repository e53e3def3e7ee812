import { likelihoodWord, type LikelihoodKey } from '../engine'
import { formatHeight, type HeightUnit } from '../units'

// Chances in plain words: the number first, then the calibrated IPCC word. Used by the outlook
// page and by briefings (page and PDF), in English and Spanish.

export type Language = 'en' | 'es'

export const LIKELIHOOD_WORDS: Record<Language, Record<LikelihoodKey, string>> = {
  en: {
    'virtually-certain': 'virtually certain',
    'extremely-likely': 'extremely likely',
    'very-likely': 'very likely',
    'likely': 'likely',
    'about-as-likely-as-not': 'about as likely as not',
    'unlikely': 'unlikely',
    'very-unlikely': 'very unlikely',
    'extremely-unlikely': 'extremely unlikely',
    'exceptionally-unlikely': 'exceptionally unlikely',
  },
  // The Spanish calibrated terms of the IPCC reports [memory].
  es: {
    'virtually-certain': 'prácticamente seguro',
    'extremely-likely': 'sumamente probable',
    'very-likely': 'muy probable',
    'likely': 'probable',
    'about-as-likely-as-not': 'tan probable como improbable',
    'unlikely': 'improbable',
    'very-unlikely': 'muy improbable',
    'extremely-unlikely': 'sumamente improbable',
    'exceptionally-unlikely': 'excepcionalmente improbable',
  },
}

const EDGE = 0.01

/** "23 %", or "less than 1 %" / "more than 99 %" at the edges, where a rounded 0 or 100 would mislead. */
export function formatChance(probability: number, language: Language): string {
  const nbsp = '\u00A0'
  if (probability < EDGE) return language === 'es' ? `menos del 1${nbsp}%` : `less than 1${nbsp}%`
  if (probability > 1 - EDGE) return language === 'es' ? `más del 99${nbsp}%` : `more than 99${nbsp}%`
  return `${Math.round(probability * 100)}${nbsp}%`
}

/** A chance after Spanish "de": "del 23 %" (de + el), but "de menos del 1 %" where it has no article. */
export function chanceAfterDe(probability: number): string {
  const chance = formatChance(probability, 'es')
  return probability < EDGE || probability > 1 - EDGE ? `de ${chance}` : `del ${chance}`
}

const SIMPLE_FRACTIONS: Array<[number, number]> = [[1, 2], [3, 5], [2, 3], [3, 4], [4, 5], [9, 10], [19, 20], [99, 100]]

/** "about a 1-in-4 chance" / "about 3 in 4": odds a council can picture. */
export function chanceAsOdds(probability: number, language: Language): string {
  const es = language === 'es'
  if (probability < EDGE) return es ? 'menos de 1 entre 100' : 'less than 1 in 100'
  if (probability > 1 - EDGE) return es ? 'casi seguro' : 'near certain'
  if (probability < 0.5) {
    const n = Math.round(1 / probability)
    return es ? `aproximadamente 1 entre ${n}` : `about a 1-in-${n} chance`
  }
  const [k, n] = SIMPLE_FRACTIONS.reduce((best, f) => Math.abs(f[0] / f[1] - probability) < Math.abs(best[0] / best[1] - probability) ? f : best)
  return es ? `aproximadamente ${k} entre ${n}` : `about ${k} in ${n}`
}

export function likelihoodPhrase(probability: number, language: Language): string {
  return LIKELIHOOD_WORDS[language][likelihoodWord(Math.min(1, Math.max(0, probability)))]
}

/** Sampling error is worth a mention when it could move the rounded percentage. */
export function samplingNote(standardError: number, language: Language): string | null {
  if (2 * standardError < 0.005) return null
  const margin = `${(2 * standardError * 100).toLocaleString(language, { minimumFractionDigits: 1, maximumFractionDigits: 1 })}\u00A0%`
  return language === 'es' ? `± ${margin} por el muestreo` : `± ${margin} from sampling`
}

/**
 * Said instead of a calibrated word where a chance depends on a release beyond its outermost published
 * level: the release does not describe that tail, so no likelihood word is earned.
 */
export const BEYOND_RANGE: Record<Language, string> = {
  en: 'extrapolated: the releases do not describe this tail',
  es: 'extrapolada: las versiones publicadas no describen esta cola',
}

/** The mark beside an extrapolated number in a table, and the note that explains it. */
// An asterisk: the briefing PDF's font has no dagger, and the mark must read the same on paper.
export const EXTRAPOLATED_MARK = '*'
export const EXTRAPOLATED_NOTE: Record<Language, string> = {
  en: '* Extrapolated: beyond the outermost level a release publishes. The release does not describe that tail; the value extends its outermost slope and carries no likelihood word.',
  es: '* Extrapolado: más allá del nivel extremo que publica una versión. La versión no describe esa cola; el valor prolonga su pendiente exterior y no lleva término de probabilidad calibrado.',
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
  const chance = formatChance(probability, language)
  const word = parts.extrapolated ? BEYOND_RANGE[language] : likelihoodPhrase(probability, language)
  const height = formatHeight(parts.height, parts.unit, language === 'es' ? 'es' : 'en')
  const note = samplingNote(parts.standardError, language)
  const qualifier = note ? `(${word}; ${note})` : `(${word})`
  return language === 'es'
    ? `Hay una probabilidad ${chanceAfterDe(probability)} ${qualifier} de que el nivel medio del mar aquí esté más de ${height} por encima de ${parts.referenceLevel} en ${parts.year}.`
    : `There is a ${chance} chance ${qualifier} that the mean sea level here will be more than ${height} above ${parts.referenceLevel} by ${parts.year}.`
}

export interface SampledChance { value: number, se: number, upperBound95?: number, lowerBound95?: number }

const percentOf = (probability: number, language: Language) =>
  `${(probability * 100).toLocaleString(language, { maximumSignificantDigits: 2 })}\u00A0%`

/**
 * How sure the sampling is of a chance: its Monte Carlo standard error, or where no sample (or every
 * sample) reached the level, the one-sided 95 % bound of the rule of three instead of "0 ± 0".
 */
export function samplingPrecision(estimate: SampledChance, language: Language): string {
  const es = language === 'es'
  if (estimate.upperBound95 !== undefined) {
    const bound = percentOf(estimate.upperBound95, language)
    return es ? `Menos del ${bound} con un 95 % de confianza: ninguna muestra llegó a ella.` : `Below ${bound} at 95 % confidence: no sample reached it.`
  }
  if (estimate.lowerBound95 !== undefined) {
    const bound = percentOf(estimate.lowerBound95, language)
    return es ? `Más del ${bound} con un 95 % de confianza: todas las muestras llegaron a ella.` : `Above ${bound} at 95 % confidence: every sample reached it.`
  }
  const se = percentOf(estimate.se, language)
  return es ? `Error estándar del muestreo: ${se}.` : `Sampling standard error: ${se}.`
}

/** "a 23 % chance" but "an 18 % chance", "an 8 % chance", "an 80 % chance": the article a number is read with. */
export function aChance(probability: number): string {
  const chance = formatChance(probability, 'en')
  return /^(8|11|18)\b|^8\d\b/.test(chance.replace(/\u00A0/g, ' ')) ? `an ${chance}` : `a ${chance}`
}
