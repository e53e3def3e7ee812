// The shape of GET /api/organisations/[id]/adoption (server/services/adoptions.ts), for the page.

export interface OfferedSeries { seriesId: string, title: string, organisationName: string, version: number, releaseId: string, anchorYears: number[] }

export interface AdoptedSeries {
  seriesId: string
  title: string
  organisationName: string
  /** null: the series has no published version now (withdrawn). */
  version: number | null
  releaseId: string | null
  anchorYears: number[] | null
  adoptedAt: string
  adoptedBy: string | null
  automatic: boolean
}

export interface CorrelationOffer {
  organisationId: string
  organisationName: string
  id: string
  title: string
  version: number
  components: string[]
  madeForSeries: Record<string, string>
}

export interface ScenarioAdoption {
  scenario: string
  decided: boolean
  components: Array<{ component: string, adopted: AdoptedSeries | null, available: OfferedSeries[] }>
  correlation: {
    decided: boolean
    adopted: CorrelationOffer | null
    adoptedUnpublished: boolean
    available: Array<CorrelationOffer & { otherSeries: string[] }>
    otherSeries: string[]
    adoptedAt: string | null
    adoptedBy: string | null
  }
}

export interface AdoptionView { organisationId: string, scenarios: ScenarioAdoption[] }

/** Who may change what their organisation adopted (the server checks again). */
export const ADOPTING_ROLES = ['planner', 'admin', 'operator'] as const
