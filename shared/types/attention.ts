import type { ReviewedKind } from '../review/rules'

/**
 * What is waiting for the signed-in person: the overview lists these first, most pressing first.
 * Facts only; the page words them in the reader's language and links each to where it is dealt with.
 */
export type AttentionItem
  /** New science moved a recorded decision and nobody has recorded a review since. */
  = | { kind: 'decision-alert', siteId: string, siteName: string, alerts: number }
  /** A decision in force whose review date has passed (overdue) or falls within the notice window. */
    | {
      kind: 'decision-review'
      siteId: string
      siteName: string
      measureName: string
      /** YYYY-MM-DD. */
      reviewDate: string
      overdue: boolean
    }
  /** An issued briefing (the latest issued version) whose figures newer outlooks change. */
    | { kind: 'stale-briefing', briefingId: string, title: string, siteName: string, changes: number }
  /** A site with no finished outlook under its planning scenario (and none being computed). */
    | { kind: 'no-planning-outlook', siteId: string, siteName: string, scenario: string }
  /** A reviewed science record submitted by a colleague that this analyst may approve or return. */
    | { kind: 'awaiting-review', recordKind: ReviewedKind, id: string, title: string, version: number }
