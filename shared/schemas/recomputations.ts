import { z } from 'zod'

/** An administrator's request to recompute every site's outlooks: one scenario, or null for all. */
export const RecomputationRequestSchema = z.object({
  scenario: z.string().trim().min(1, 'Choose a scenario, or all scenarios.').max(60).nullable(),
}).strict()
