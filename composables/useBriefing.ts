import type { ApiResponse } from '~/utils/apiResponse'

/** A row of GET /api/briefings. */
export type BriefingRow = ApiResponse<'/api/briefings'>[number]

/**
 * GET /api/briefings/[id]: the stored fields, who may change it, the document to show and, once issued, what newer
 * outlooks changed.
 */
export type BriefingView = ApiResponse<'/api/briefings/:id'>

/** One briefing, keyed by id so the toolbar's refresh() after an action re-reads only this one. */
export function useBriefing(id: string) {
  return useFetch(`/api/briefings/${id}`, { key: `briefing-${id}` })
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
  includePathways: boolean
}

/** The choices the form offers, all from the outlook and its site. */
export interface BriefingFormChoices {
  thresholds: { id: string, label: string, height: number }[]
  years: number[]
  /** Finished outlooks of the site under other scenarios, the latest of each. */
  comparisons: { id: string, scenario: string, samples: number }[]
  /** The site's adaptation pathways and decision records: the section is offered only with a pathway. */
  pathways: { pathways: number, records: number }
}
