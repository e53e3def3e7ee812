import { formatHeight, type HeightUnit } from '../units'
import { aChance, chanceAfterDe, formatChance, likelihoodPhrase, type Language } from './chance'

// Flood levels in plain words. A flood level is a height of the total water level (a crest, a floor,
// a road), reached by the year's highest tides and surges on top of the mean sea level: its numbers
// are a chance in a given year, how often, and the chance over an asset's life — never the chance
// that the mean sea level passes it.

export interface FloodWordingContext { datum: string, unit: HeightUnit, language: Language }

const height = (metres: number, context: FloodWordingContext) => formatHeight(metres, context.unit, context.language)
const number = (value: number, language: Language, digits: number) => value.toLocaleString(language, { maximumSignificantDigits: digits })

/** "about once every 40 years" / "about 3 times a year": how often the water reaches a level. */
export function howOften(expectedPerYear: number, language: Language): string {
  const es = language === 'es'
  if (!(expectedPerYear > 0)) return es ? 'nunca en las muestras' : 'never in the samples'
  if (expectedPerYear >= 1.5) return es ? `unas ${number(expectedPerYear, language, 2)} veces al año` : `about ${number(expectedPerYear, language, 2)} times a year`
  if (expectedPerYear >= 0.75) return es ? 'aproximadamente una vez al año' : 'about once a year'
  const years = 1 / expectedPerYear
  return es ? `aproximadamente una vez cada ${number(years, language, 2)} años` : `about once every ${number(years, language, 2)} years`
}

/**
 * "In 2070 the water is expected to reach 2.30 m above <datum> about once every 4 years: a 22 % chance
 * in any one year."
 */
export function floodYearSentence(parts: { year: number, height: number, annualChance: number, expectedPerYear: number }, context: FloodWordingContext): string {
  const often = howOften(parts.expectedPerYear, context.language)
  const level = height(parts.height, context)
  return context.language === 'es'
    ? `En ${parts.year} se espera que el agua alcance ${level} sobre ${context.datum} ${often}: una probabilidad ${chanceAfterDe(parts.annualChance)} en un año cualquiera.`
    : `In ${parts.year} the water is expected to reach ${level} above ${context.datum} ${often}: ${aChance(parts.annualChance)} chance in any one year.`
}

/**
 * "Built in 2031 for 50 years (2031–2080): a 97 % chance (very likely) that the water reaches the
 * level at least once in that time."
 */
export function lifeSentence(parts: { buildYear: number, lifeYears: number, chance: number }, language: Language): string {
  const end = parts.buildYear + parts.lifeYears - 1
  const chance = formatChance(parts.chance, language)
  const word = likelihoodPhrase(parts.chance, language)
  return language === 'es'
    ? `Construida en ${parts.buildYear} para ${parts.lifeYears} años (${parts.buildYear}–${end}): una probabilidad ${chanceAfterDe(parts.chance)} (${word}) de que el agua alcance la cota al menos una vez en ese tiempo.`
    : `Built in ${parts.buildYear} for ${parts.lifeYears} years (${parts.buildYear}–${end}): a ${chance} chance (${word}) that the water reaches the level at least once in that time.`
}

/** "For a 10 % chance of at least one overtopping in that life, the level would have to be 2.95 m above <datum>: its design-life level." */
export function designLifeLevelSentence(parts: { chance: number, level: number }, context: FloodWordingContext): string {
  const chance = formatChance(parts.chance, context.language)
  const level = height(parts.level, context)
  return context.language === 'es'
    ? `Para que la probabilidad de al menos un rebase en esa vida útil sea ${chanceAfterDe(parts.chance)}, la cota tendría que estar a ${level} sobre ${context.datum}: es la cota de vida útil de diseño.`
    : `For a ${chance} chance of at least one overtopping in that life, the level would have to be ${level} above ${context.datum}: its design-life level.`
}

/**
 * Amplification as expected events. A level reached on average once every T years today is expected
 * e^{rise/λ} times as often under a rise, on average: the multiple is exact for the expected number of
 * floods a year, not for the chance of one, which grows less (and can never pass 100 %). Past one
 * expected event a year a multiple says nothing a planner can use, so it becomes "every year or more
 * often". `today` is T; `amplification` the outlook's mean e^{rise/λ}.
 */
export function todaysLevelExpected(parts: { today: number, amplification: number }, language: Language): string {
  const es = language === 'es'
  // Today's expected events a year at the T-year level: −ln(1 − 1/T), the Gumbel's Poisson rate.
  const perYear = parts.amplification * -Math.log1p(-1 / parts.today)
  if (perYear >= 1) return es ? 'todos los años o más a menudo' : 'every year or more often'
  const multiple = number(parts.amplification, language, parts.amplification < 10 ? 2 : 3)
  const every = number(1 / perYear, language, 2)
  return es
    ? `aproximadamente una vez cada ${every} años (${multiple} veces más inundaciones esperadas que hoy)`
    : `about once every ${every} years (${multiple} times as many expected floods as today)`
}

/**
 * "Without that raise, today's 100-year level would be reached about once every 5.5 years (18.3 times as
 * many expected floods as today): a 17 % chance in any one year." The chance beside the expected events.
 */
export function amplificationSentence(parts: { today: number, amplification: number, annualChance: number }, language: Language): string {
  const often = todaysLevelExpected(parts, language)
  return language === 'es'
    ? `Sin esa elevación, el nivel de ${parts.today} años de hoy se alcanzaría ${often}: una probabilidad ${chanceAfterDe(parts.annualChance)} en un año cualquiera.`
    : `Without that raise, today's ${parts.today}-year level would be reached ${often}: ${aChance(parts.annualChance)} chance in any one year.`
}

/** The return period amplification is worded for: today's 100-year level, or the rarest one computed. */
export function amplificationReturnPeriod<T extends { today: number }>(periods: T[]): T | undefined {
  return periods.find(period => period.today === 100) ?? periods.reduce<T | undefined>((rarest, period) => (!rarest || period.today > rarest.today ? period : rarest), undefined)
}
