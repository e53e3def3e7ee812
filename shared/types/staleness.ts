// What newer outlooks change in an issued briefing: worked out when a site's outlooks are computed
// again (server/services/briefing-staleness.ts) and stored on the briefing, so its pages only read it.

export interface StaleFigure {
  scenario: string
  thresholdId: string
  threshold: string
  kind: 'mean-sea-level' | 'flood-level'
  year: number
  /** The chance the briefing states, and the latest outlook's. */
  was: number
  now: number
}

export interface Staleness {
  /** The latest finished outlook of each of the briefing's scenarios, in the briefing's order. */
  latestOutlookIds: string[]
  changes: StaleFigure[]
}
