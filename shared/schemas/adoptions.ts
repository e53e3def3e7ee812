import { z } from 'zod'
import { COMPONENTS } from '../types/science'
import { scenarioField } from './releases'

// What an organisation adopts for one scenario: a series of releases per component, and whose
// correlation sets (or none). Components left out keep what they had.

const CHOOSE_COMPONENTS = `Choose components from: ${COMPONENTS.join(', ')}.`

export const AdoptionSchema = z.strictObject(
  {
    scenario: scenarioField,
    series: z
      .partialRecord(
        z.enum(COMPONENTS, { error: CHOOSE_COMPONENTS }),
        z.uuid({ error: 'Choose a published series from the list.' }),
        {
          error: issue =>
            (issue.code as string) === 'unrecognized_keys'
              ? CHOOSE_COMPONENTS
              : issue.code === 'invalid_type'
                ? 'Give the series to adopt per component, as { component: series id }.'
                : undefined,
        },
      )
      .optional(),
    /** The organisation whose correlation sets to use for this scenario; null for none (independent sources). */
    correlation: z.uuid({ error: 'Choose a published correlation set from the list, or none.' }).nullable().optional(),
  },
  {
    error: issue =>
      issue.code === 'unrecognized_keys'
        ? `Send only scenario, series and correlation (not ${issue.keys.join(', ')}).`
        : undefined,
  },
)

export type AdoptionInput = z.infer<typeof AdoptionSchema>
