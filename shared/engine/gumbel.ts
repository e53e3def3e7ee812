import { EngineInputError } from './errors'

// Gumbel (type I extreme value) statistics of annual-maximum water levels:
// F(z) = exp(−exp(−(z − μ)/λ)), location μ, scale λ (metres).

export const EULER_GAMMA = 0.5772156649015329

export interface GumbelParameters {
  location: number
  scale: number
}

function checkScale(scale: number, path = 'scale'): void {
  if (!(scale > 0) || !Number.isFinite(scale)) {
    throw new EngineInputError([{ path, message: `must be a positive Gumbel scale in metres, got ${scale}` }])
  }
}

export function gumbelCdf(level: number, { location, scale }: GumbelParameters): number {
  checkScale(scale)
  return Math.exp(-Math.exp(-(level - location) / scale))
}

/** Level reached on average once in T years: z_T = μ − λ·ln(−ln(1 − 1/T)). */
export function gumbelReturnLevel({ location, scale }: GumbelParameters, returnPeriodYears: number): number {
  checkScale(scale)
  if (!(returnPeriodYears > 1)) {
    throw new EngineInputError([
      { path: 'returnPeriodYears', message: `must be above 1 year, got ${returnPeriodYears}` },
    ])
  }
  return location - scale * Math.log(-Math.log1p(-1 / returnPeriodYears))
}

/** Chance that an event with a T-year return period happens at least once in `years` years: 1 − (1 − 1/T)ⁿ. */
export function chanceOfAtLeastOne(returnPeriodYears: number, years: number): number {
  if (!(returnPeriodYears >= 1)) {
    throw new EngineInputError([
      { path: 'returnPeriodYears', message: `must be at least 1 year, got ${returnPeriodYears}` },
    ])
  }
  if (!(years >= 0) || !Number.isFinite(years)) {
    throw new EngineInputError([{ path: 'years', message: `must be zero or more years, got ${years}` }])
  }
  return -Math.expm1(years * Math.log1p(-1 / returnPeriodYears))
}

function checkMaxima(annualMaxima: readonly number[]): void {
  if (annualMaxima.length < 2) {
    throw new EngineInputError([
      { path: 'annualMaxima', message: `needs at least 2 annual maxima, got ${annualMaxima.length}` },
    ])
  }
  const bad = annualMaxima.findIndex(value => !Number.isFinite(value))
  if (bad >= 0) {
    throw new EngineInputError([
      { path: `annualMaxima[${bad}]`, message: `must be a finite level in metres, got ${annualMaxima[bad]}` },
    ])
  }
}

/** Method of moments from a mean and standard deviation: λ = √6·s/π, μ = x̄ − γλ. */
export function gumbelFromMoments(mean: number, sd: number): GumbelParameters {
  if (!(sd > 0) || !Number.isFinite(sd) || !Number.isFinite(mean)) {
    throw new EngineInputError([
      { path: 'sd', message: `needs a finite mean and a positive standard deviation, got ${mean}, ${sd}` },
    ])
  }
  const scale = (Math.sqrt(6) * sd) / Math.PI
  return { location: mean - EULER_GAMMA * scale, scale }
}

/** Method of moments on annual maxima (sample standard deviation, n − 1). */
export function fitGumbelByMoments(annualMaxima: readonly number[]): GumbelParameters {
  checkMaxima(annualMaxima)
  const n = annualMaxima.length
  const mean = annualMaxima.reduce((sum, value) => sum + value, 0) / n
  const variance = annualMaxima.reduce((sum, value) => sum + (value - mean) ** 2, 0) / (n - 1)
  return gumbelFromMoments(mean, Math.sqrt(variance))
}

/**
 * L-moments (Hosking & Wallis 1997, Regional Frequency Analysis): b0 = x̄, b1 = (1/n)Σ (j−1)/(n−1)·x₍ⱼ₎
 * ascending, l1 = b0, l2 = 2b1 − b0, λ = l2/ln 2, μ = l1 − γλ. Less swayed by one extreme year than moments.
 */
export function fitGumbelByLMoments(annualMaxima: readonly number[]): GumbelParameters {
  checkMaxima(annualMaxima)
  const sorted = [...annualMaxima].sort((a, b) => a - b)
  const n = sorted.length
  let b0 = 0
  let b1 = 0
  for (let j = 1; j <= n; j++) {
    b0 += sorted[j - 1]!
    b1 += ((j - 1) / (n - 1)) * sorted[j - 1]!
  }
  b0 /= n
  b1 /= n
  const l2 = 2 * b1 - b0
  if (!(l2 > 0)) {
    throw new EngineInputError([
      { path: 'annualMaxima', message: 'all annual maxima are equal; a Gumbel fit needs some spread' },
    ])
  }
  const scale = l2 / Math.LN2
  return { location: b0 - EULER_GAMMA * scale, scale }
}
