import { z } from 'zod'
import { THRESHOLD_KINDS } from '../types/science'
import { scenarioField } from '../schemas/releases'

// Measures, pathways and decision records as a planner enters them. Heights are metres above the
// site's datum, like its thresholds; rules that need the site (today's level) are checked by the service.

export const COST_BANDS = ['low', 'medium', 'high', 'very-high'] as const
export type CostBand = typeof COST_BANDS[number]

export const MAX_MEASURES = 12
export const MAX_STEPS = 8
export const DEFAULT_PATHWAY_TOLERANCES = [0.1, 0.5]

const text = (what: string, max: number) => z.string({ error: `Enter the ${what}.` }).trim()
  .min(1, { error: `Enter the ${what}.` }).max(max, { error: `Use at most ${max} characters.` })

export const MeasureSchema = z.object(
  {
    name: text('measure\'s name, like "Raise the quay wall to 2.8 m"', 120),
    /** null: the measure does not depend on a height (managed retreat) and does not tip within the outlook. */
    height: z
      .number({
        error:
          'Enter the height the measure protects to, in metres above the site\'s datum, or null for a measure without one (managed retreat).',
      })
      .min(-5, { error: 'The height must be at least -5 m.' })
      .max(20, { error: 'The height must be at most 20 m.' })
      .nullable(),
    kind: z
      .enum(THRESHOLD_KINDS, {
        error:
          'Say whether the height is compared with the mean sea level or is a flood level (the total water level).',
      })
      .default('mean-sea-level'),
    leadTimeYears: z
      .number({ error: 'Enter the lead time in whole years (0 for a measure already in place).' })
      .int({ error: 'Enter the lead time in whole years.' })
      .min(0, {
        error:
          'A lead time cannot be negative: enter the years needed to decide, design and build the measure (0 for one already in place).',
      })
      .max(100, { error: 'A lead time is at most 100 years.' }),
    designLifeYears: z
      .number({ error: 'Enter the design life in whole years, or leave it empty.' })
      .int({ error: 'Enter whole years.' })
      .min(1, { error: 'A design life is at least 1 year.' })
      .max(200, { error: 'A design life is at most 200 years.' })
      .nullable()
      .default(null),
    costBand: z
      .enum(COST_BANDS, { error: `Choose a cost band: ${COST_BANDS.join(', ')}, or leave it empty.` })
      .nullable()
      .default(null),
  },
  { error: 'Send the measure as { name, height, kind, leadTimeYears }.' },
)

const tolerance = z
  .number({ error: 'Enter each tolerance as a chance between 0 and 1, like 0.1 for 10 %.' })
  .min(0.01, { error: 'A tolerance is at least 0.01 (1 %).' })
  .max(0.99, { error: 'A tolerance is at most 0.99 (99 %).' })

export const PathwaySchema = z
  .object({
    name: text('pathway\'s name', 120),
    measureIds: z
      .array(z.uuid({ error: 'Choose measures of this site.' }), {
        error: 'List the measures in the order they follow one another.',
      })
      .min(2, { error: 'A pathway needs at least two measures: the one in service and the one that follows.' })
      .max(MAX_STEPS, { error: `A pathway has at most ${MAX_STEPS} measures.` }),
    tolerances: z
      .array(tolerance, { error: 'Send the tolerances as a list of chances.' })
      .min(1, { error: 'Give at least one tolerance.' })
      .max(4, { error: 'Give at most four tolerances.' })
      .default([...DEFAULT_PATHWAY_TOLERANCES]),
  })
  .superRefine((pathway, context) => {
    // A pathway moves from each measure to the next once; coming back to one would be a cycle.
    const seen = new Map<string, number>()
    pathway.measureIds.forEach((id, i) => {
      const first = seen.get(id)
      if (first !== undefined) {
        context.addIssue({
          code: 'custom',
          path: ['measureIds', i],
          message: `This measure is already step ${first + 1}; a pathway cannot return to an earlier measure (a cycle). Remove the repeat or add a new measure.`,
        })
      }
      else seen.set(id, i)
    })
    if (new Set(pathway.tolerances).size !== pathway.tolerances.length) {
      context.addIssue({ code: 'custom', path: ['tolerances'], message: 'Give each tolerance once.' })
    }
  })

const isoDate = z
  .string({ error: 'Enter the review date as YYYY-MM-DD.' })
  .regex(/^\d{4}-\d{2}-\d{2}$/, { error: 'Enter the review date as YYYY-MM-DD.' })
  .refine(
    value =>
      !Number.isNaN(Date.parse(`${value}T00:00:00Z`)) && new Date(`${value}T00:00:00Z`).toISOString().startsWith(value),
    { error: 'Enter a real calendar date as YYYY-MM-DD.' },
  )

export const DecisionRecordSchema = z.object({
  pathwayId: z.uuid({ error: 'Choose a pathway of this site.' }),
  /** The measure decided on: a step of the pathway after the first. */
  measureId: z.uuid({ error: 'Choose the measure decided on.' }),
  scenario: scenarioField,
  tolerance,
  rationale: text('rationale: why the council chose this measure, scenario and tolerance', 4000),
  reviewDate: isoDate,
  /** Mail the planners when new science moves the tipping year by more than this many years. */
  marginYears: z
    .number({ error: 'Enter the margin in whole years.' })
    .int({ error: 'Enter the margin in whole years.' })
    .min(0, { error: 'The margin cannot be negative.' })
    .max(50, { error: 'The margin is at most 50 years.' })
    .default(5),
  /** Set when this record reviews an earlier one (after an alert). */
  reviewsRecordId: z.uuid({ error: 'Choose the record this one reviews.' }).nullable().default(null),
})

export type MeasureInput = z.infer<typeof MeasureSchema>
export type PathwayInput = z.infer<typeof PathwaySchema>
export type DecisionRecordInput = z.infer<typeof DecisionRecordSchema>

/** `/api/sites/[id]/measures/[measureId]` and `/api/sites/[id]/pathways/[pathwayId]`. */
export const MeasureParams = z.object({ id: z.uuid(), measureId: z.uuid() })
export const PathwayParams = z.object({ id: z.uuid(), pathwayId: z.uuid() })
