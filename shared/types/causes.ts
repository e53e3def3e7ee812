// Why a site's outlooks were computed again, stored as facts (in a recomputation row and in its jobs)
// and worded where they are shown: the watchers' e-mails in each watcher's language, the operator's
// recomputations page in the reader's (shared/wording/causes.ts).

export type ScienceAction = 'published' | 'withdrawn'

export type RecomputationCause
  = | { kind: 'release', action: ScienceAction, component: string, version: number, scenario: string }
    | { kind: 'correlation-set', action: ScienceAction, scenario: string }
    | { kind: 'scale-factor-grid', action: ScienceAction, component: string, version: number }
    | { kind: 'site-edited', site: string }
    | { kind: 'annual-maxima', site: string }
  /** A new version of the site's tide-gauge record: what the observation-updated numbers rest on. */
    | { kind: 'gauge-record', site: string, version: number }
  /** A new version of the site's land motion as posterior draws: what the outlooks now sample. */
    | { kind: 'land-motion-draws', site: string, version: number }
  /** An operator asked (after an engine upgrade, say); scenario null is every scenario. */
    | { kind: 'requested', scenario: string | null }

/**
 * What a recomputation row or a queued job holds: a cause, or, for those stored before causes were
 * facts, the finished sentence in each language (worded as stored; nothing rewrites old rows).
 */
export type StoredCause = RecomputationCause | Record<string, string>
