import { EngineInputError } from './errors'

// IPCC calibrated likelihood language (Mastrandrea et al. 2010, guidance note Table 1, reused by AR6 WG1).
// The bands are nested; the word is that of the narrowest band holding p, and a probability on a band
// edge takes the more cautious (less confident) word. "More likely than not" (>50–100 %) is never the
// narrowest band for any p — "likely" or "about as likely as not" always is — so it is never returned.

export type LikelihoodKey
  = | 'virtually-certain'
    | 'extremely-likely'
    | 'very-likely'
    | 'likely'
    | 'about-as-likely-as-not'
    | 'unlikely'
    | 'very-unlikely'
    | 'extremely-unlikely'
    | 'exceptionally-unlikely'

/** The bands, for legends; probabilities as fractions. */
export const LIKELIHOOD_BANDS: ReadonlyArray<{ key: LikelihoodKey, low: number, high: number }> = [
  { key: 'virtually-certain', low: 0.99, high: 1 },
  { key: 'extremely-likely', low: 0.95, high: 1 },
  { key: 'very-likely', low: 0.9, high: 1 },
  { key: 'likely', low: 0.66, high: 1 },
  { key: 'about-as-likely-as-not', low: 0.33, high: 0.66 },
  { key: 'unlikely', low: 0, high: 0.33 },
  { key: 'very-unlikely', low: 0, high: 0.1 },
  { key: 'extremely-unlikely', low: 0, high: 0.05 },
  { key: 'exceptionally-unlikely', low: 0, high: 0.01 },
]

/** The calibrated word (as a stable key the UI translates) for a probability in [0, 1]. */
export function likelihoodWord(probability: number): LikelihoodKey {
  if (!(probability >= 0 && probability <= 1)) {
    throw new EngineInputError([
      { path: 'probability', message: `must be a probability in [0, 1], got ${probability}` },
    ])
  }
  // Strict comparisons on the "likely" side and inclusive ones on the "unlikely" side put every edge
  // into the less confident band (0.99 → extremely likely, 0.33 → about as likely as not, 0.1 → unlikely).
  if (probability > 0.99) return 'virtually-certain'
  if (probability > 0.95) return 'extremely-likely'
  if (probability > 0.9) return 'very-likely'
  if (probability > 0.66) return 'likely'
  if (probability >= 0.33) return 'about-as-likely-as-not'
  if (probability >= 0.1) return 'unlikely'
  if (probability >= 0.05) return 'very-unlikely'
  if (probability >= 0.01) return 'extremely-unlikely'
  return 'exceptionally-unlikely'
}
