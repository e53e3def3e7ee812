import type { ApiResponse } from '~/utils/apiResponse'

/** GET /api/organisations/[id]/adoption (server/services/adoptions.ts), for the page. */
export type AdoptionView = ApiResponse<'/api/organisations/:id/adoption'>
export type ScenarioAdoption = AdoptionView['scenarios'][number]

/** Who may change what their organisation adopted (the server checks again). */
export const ADOPTING_ROLES = ['planner', 'admin', 'operator'] as const
