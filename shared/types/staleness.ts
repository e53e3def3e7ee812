// What newer outlooks change in an issued briefing: worked out when a site's outlooks are computed
// again (server/services/briefing-staleness.ts) and stored on the briefing, so its pages only read it.

export interface StaleFigure {
  scenario: string
  thresholdId: string
  threshold: string
  /**
   * Which chance: above the mean sea level or the flood level's in a year, both as the outlook states
   * them; `gauge-updated`, the chance above the mean sea level updated by the site's gauge record, as the
   * briefing's gauge section states it; `gauge-update-gone`, that section's chance where the latest
   * outlook gives no update any more (no record, or one too unlike the trajectories: `now` is null);
   * `gauge-update-new`, a chance the latest outlook updates by a gauge record where the briefing gave
   * none (it had no record, or its record was refused: `was` is null).
   */
  kind: 'mean-sea-level' | 'flood-level' | 'gauge-updated' | 'gauge-update-gone' | 'gauge-update-new'
  year: number
  /** The chance the briefing states, and the latest outlook's. */
  was: number | null
  now: number | null
}

export interface Staleness {
  /** The latest finished outlook of each of the briefing's scenarios, in the briefing's order. */
  latestOutlookIds: string[]
  changes: StaleFigure[]
}
