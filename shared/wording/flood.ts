import { formatHeight, type HeightUnit } from '../units'
import { chanceForms, likelihoodPhrase } from './chance'
import { translator, type Language } from './translate'

// Flood levels in plain words. A flood level is a height of the total water level (a crest, a floor,
// a road), reached by the year's highest tides and surges on top of the mean sea level: its numbers
// are a chance in a given year, how often, and the chance over an asset's life — never the chance
// that the mean sea level passes it. The words are in locales/<language>/chance.json (chance.flood.*).

export interface FloodWordingContext { datum: string, unit: HeightUnit, language: Language }

const height = (metres: number, context: FloodWordingContext) => formatHeight(metres, context.unit, context.language)
const number = (value: number, language: Language, digits: number) =>
  value.toLocaleString(language, { maximumSignificantDigits: digits })

/** "about once every 40 years" / "about 3 times a year": how often the water reaches a level. */
export function howOften(expectedPerYear: number, language: Language): string {
  const t = translator(language)
  if (!(expectedPerYear > 0)) return t('chance.flood.never')
  if (expectedPerYear >= 1.5) return t('chance.flood.times', { n: number(expectedPerYear, language, 2) })
  if (expectedPerYear >= 0.75) return t('chance.flood.once')
  return t('chance.flood.every', { years: number(1 / expectedPerYear, language, 2) })
}

/**
 * "In 2070 the water is expected to reach 2.30 m above <datum> about once every 4 years: a 22 % chance
 * in any one year."
 */
export function floodYearSentence(
  parts: { year: number, height: number, annualChance: number, expectedPerYear: number },
  context: FloodWordingContext,
): string {
  return translator(context.language)('chance.flood.year', {
    year: parts.year,
    level: height(parts.height, context),
    datum: context.datum,
    often: howOften(parts.expectedPerYear, context.language),
    ...chanceForms(parts.annualChance, context.language),
  })
}

/**
 * "Built in 2031 for 50 years (2031–2080): a 97 % chance (very likely) that the water reaches the
 * level at least once in that time."
 */
export function lifeSentence(
  parts: { buildYear: number, lifeYears: number, chance: number },
  language: Language,
): string {
  return translator(language)('chance.flood.life', {
    buildYear: parts.buildYear,
    lifeYears: parts.lifeYears,
    end: parts.buildYear + parts.lifeYears - 1,
    word: likelihoodPhrase(parts.chance, language),
    ...chanceForms(parts.chance, language),
  })
}

/**
 * "For a 10 % chance of at least one overtopping in that life, the level would have to be 2.95 m above <datum>: its
 * design-life level."
 */
export function designLifeLevelSentence(
  parts: { chance: number, level: number },
  context: FloodWordingContext,
): string {
  return translator(context.language)('chance.flood.designLife', {
    level: height(parts.level, context),
    datum: context.datum,
    ...chanceForms(parts.chance, context.language),
  })
}

/**
 * Amplification as expected events. A level reached on average once every T years today is expected
 * e^{rise/λ} times as often under a rise, on average: the multiple is exact for the expected number of
 * floods a year, not for the chance of one, which grows less (and can never pass 100 %). Past one
 * expected event a year a multiple says nothing a planner can use, so it becomes "every year or more
 * often". `today` is T; `amplification` the outlook's mean e^{rise/λ}.
 */
export function todaysLevelExpected(parts: { today: number, amplification: number }, language: Language): string {
  const t = translator(language)
  // Today's expected events a year at the T-year level: −ln(1 − 1/T), the Gumbel's Poisson rate.
  const perYear = parts.amplification * -Math.log1p(-1 / parts.today)
  if (perYear >= 1) return t('chance.flood.everyYear')
  const multiple = number(parts.amplification, language, parts.amplification < 10 ? 2 : 3)
  return t('chance.flood.expected', { every: number(1 / perYear, language, 2), multiple })
}

/**
 * "Without that raise, today's 100-year level would be reached about once every 5.5 years (18.3 times as
 * many expected floods as today): a 17 % chance in any one year." The chance beside the expected events.
 */
export function amplificationSentence(
  parts: { today: number, amplification: number, annualChance: number },
  language: Language,
): string {
  return translator(language)('chance.flood.amplification', {
    today: parts.today,
    often: todaysLevelExpected(parts, language),
    ...chanceForms(parts.annualChance, language),
  })
}

/** The return period amplification is worded for: today's 100-year level, or the rarest one computed. */
export function amplificationReturnPeriod<T extends { today: number }>(periods: T[]): T | undefined {
  return (
    periods.find(period => period.today === 100)
    ?? periods.reduce<T | undefined>(
      (rarest, period) => (!rarest || period.today > rarest.today ? period : rarest),
      undefined,
    )
  )
}
