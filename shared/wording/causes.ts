import type { RecomputationCause, StoredCause } from '../types/causes'
import { translator, type Language } from './translate'

const KINDS = new Set<string>([
  'release',
  'correlation-set',
  'scale-factor-grid',
  'site-edited',
  'annual-maxima',
  'gauge-record',
  'land-motion-draws',
  'requested',
] satisfies RecomputationCause['kind'][])

function isCause(cause: StoredCause): cause is RecomputationCause {
  return typeof cause.kind === 'string' && KINDS.has(cause.kind)
}

/** The sentence that opens a "what changed" e-mail and fills the recomputations page's "Why" column. */
export function causeSentence(cause: StoredCause, language: Language): string {
  // Stored before causes were facts: the sentence itself, in each language.
  if (!isCause(cause)) return cause[language] ?? cause.en ?? ''
  const t = translator(language)
  const component = (key: string) => t(`document.components.${key}`)
  switch (cause.kind) {
    case 'release':
      return t(`causes.release.${cause.action}`, {
        component: component(cause.component),
        version: cause.version,
        scenario: cause.scenario,
      })
    case 'correlation-set':
      return t(`causes.correlationSet.${cause.action}`, { scenario: cause.scenario })
    case 'scale-factor-grid':
      return t(`causes.scaleFactorGrid.${cause.action}`, {
        component: component(cause.component),
        version: cause.version,
      })
    case 'site-edited':
      return t('causes.siteEdited', { site: cause.site })
    case 'annual-maxima':
      return t('causes.annualMaxima', { site: cause.site })
    case 'gauge-record':
      return t('causes.gaugeRecord', { site: cause.site, version: cause.version })
    case 'land-motion-draws':
      return t('causes.landMotionDraws', { site: cause.site, version: cause.version })
    case 'requested':
      return cause.scenario ? t('causes.requestedScenario', { scenario: cause.scenario }) : t('causes.requested')
  }
}
