import type { BriefingDocument } from '#shared/briefing/document'
import type { StaleFigure } from '~/components/briefing/BriefingStaleNotice.vue'

/** A row of GET /api/briefings (dates arrive as strings). */
export interface BriefingRow {
  id: string
  title: string
  version: number
  state: 'draft' | 'issued'
  siteId: string
  siteName: string
  language: 'en' | 'es'
  issuedAt: string | null
  shared: boolean
  previousId: string | null
  updatedAt: string
}

/** GET /api/briefings/[id]: the stored fields, who may change it, and the document to show. */
export interface BriefingView extends Omit<BriefingRow, 'siteName'> {
  audience: string
  localContext: string
  units: 'm' | 'ft'
  thresholdIds: string[]
  years: number[]
  /** The first is the outlook the briefing is issued from; the rest are compared with it. */
  outlookIds: string[]
  canEdit: boolean
  shareToken: string | null
  /** The configured public address (APP_URL) that links are built on. */
  appUrl: string
  /** The live page the document points to: the share link (planners, once shared), else the page inside, which needs a sign-in. */
  live: { url: string, signIn: boolean }
  document: BriefingDocument
  /** Issued briefings only: the figures newer outlooks have changed; null while it is current. */
  staleness: { changes: StaleFigure[] } | null
}

/** One briefing, keyed by id so the toolbar's refresh() after an action re-reads only this one. */
export function useBriefing(id: string) {
  return useFetch<BriefingView>(`/api/briefings/${id}`, { key: `briefing-${id}` })
}

/** What the issue form edits: the body of POST (with outlookId) and PATCH /api/briefings. */
export interface BriefingFormModel {
  title: string
  audience: string
  localContext: string
  language: 'en' | 'es'
  units: 'm' | 'ft'
  thresholdIds: string[]
  years: number[]
  comparisonOutlookIds: string[]
}

/** The choices the form offers, all from the outlook and its site. */
export interface BriefingFormChoices {
  thresholds: { id: string, label: string, height: number }[]
  years: number[]
  /** Finished outlooks of the site under other scenarios, the latest of each. */
  comparisons: { id: string, scenario: string, samples: number }[]
}
