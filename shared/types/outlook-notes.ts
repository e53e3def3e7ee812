/**
 * Something a reader should know about how an outlook was put together. Stored as facts, so every
 * reader sees it worded in their own language (`outlook.notes.*` in the locales). Outlooks computed
 * before notes were stored this way hold English sentences, which are shown as they are.
 */
export type OutlookNote
  = | { kind: 'unscaled', components: string[] }
    | { kind: 'uncorrelated', scenario: string }
    | { kind: 'life-beyond-releases', threshold: string, lastYear: number }
  /** The adopted correlation set was made for other series of these components; it is applied all the same. */
    | { kind: 'correlation-other-series', components: string[] }

export type StoredOutlookNote = OutlookNote | string
