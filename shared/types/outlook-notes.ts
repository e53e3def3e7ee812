/**
 * Something a reader should know about how an outlook was put together. Stored as facts, so every
 * reader sees it worded in their own language (`outlook.notes.*` in the locales). Outlooks computed
 * before notes were stored this way hold English sentences, which are shown as they are.
 */
export type OutlookNote =
  | { kind: 'unscaled', components: string[] }
  | { kind: 'uncorrelated', scenario: string }
  | { kind: 'life-beyond-releases', threshold: string, lastYear: number }

export type StoredOutlookNote = OutlookNote | string
