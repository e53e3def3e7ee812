import { z } from 'zod'
import { COMPONENTS } from '../types/science'
import { scenarioField } from './releases'

// What an organisation adopts for one scenario: a series of releases per component, and whose
// correlation sets (or none). Components left out keep what they had.

const seriesId = z.uuid({ error: 'Choose a published series from the list.' })

export const AdoptionSchema = z.object({
  scenario: scenarioField,
  series: z.partialRecord(z.enum(COMPONENTS, { error: `Choose components from: ${COMPONENTS.join(', ')}.` }), seriesId, { error: 'Give the series to adopt per component.' }).optional(),
  /** The organisation whose correlation sets to use for this scenario; null for none (independent sources). */
  correlation: z.uuid({ error: 'Choose a published correlation set from the list, or none.' }).nullable().optional(),
}).strict()

export type AdoptionInput = z.infer<typeof AdoptionSchema>
