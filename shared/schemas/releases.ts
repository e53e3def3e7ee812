import { z } from 'zod'
import { textField } from './text'
import {
  MAX_ANCHOR_YEARS,
  MAX_DRAW_VALUES,
  MAX_QUANTILE_LEVELS,
  MAX_TEXT,
  MAX_UPLOADED_DRAWS,
} from '../releases/limits'
import { AMOUNT_UNITS, COMPONENTS, RELEASE_FORMS, REVIEW_STATES, SCENARIO_PATTERN } from '../types/science'

// Requests about published science. Per-form numbers are checked by the engine's release rules
// (shared/engine/release-validation.ts) after unit conversion, so both paths say the same thing.

const text = (what: string, max: number) => textField({ error: `Enter the ${what}.` }).trim()
  .min(1, { error: `Enter the ${what}.` }).max(max, { error: `Use at most ${max} characters.` })

export const componentField = z.enum(COMPONENTS, { error: `Choose one of: ${COMPONENTS.join(', ')}.` })
// A blank scenario is asked for, not explained: the pattern's rule is for one that was typed.
export const scenarioField = z
  .string({ error: 'Enter a scenario, like SSP2-4.5.' })
  .trim()
  .min(1, { error: 'Enter a scenario, like SSP2-4.5.', abort: true })
  .regex(SCENARIO_PATTERN, {
    error: 'Use 2–40 letters, digits, spaces or . + - _ (for example SSP2-4.5 or high-end-ice).',
  })

const numberList = z.array(z.number({ error: 'Enter a number (not blank, NaN or infinity).' }), {
  error: 'Enter a list of numbers.',
})
const numberTable = z.array(numberList, { error: 'Enter a table of numbers.' })

// The same limits as a CSV upload, for numbers sent as JSON: the engine runs on what passes here, on
// the request thread, so nothing an analyst sends may make it run for long.
const atMost = (max: number, what: string) => ({ error: `Use at most ${max.toLocaleString('en')} ${what}.` })
const anchorYearsField = z
  .array(z.number({ error: 'Enter whole years.' }).int({ error: 'Enter whole years.' }), {
    error: 'Enter the anchor years as a list of years.',
  })
  .max(MAX_ANCHOR_YEARS, atMost(MAX_ANCHOR_YEARS, 'anchor years'))
const perAnchorList = numberList.max(MAX_ANCHOR_YEARS, atMost(MAX_ANCHOR_YEARS, 'anchor years'))
const levelsField = numberList.max(MAX_QUANTILE_LEVELS, atMost(MAX_QUANTILE_LEVELS, 'probability levels'))
const quantileValues = z
  .array(levelsField, { error: 'Enter a table of numbers.' })
  .max(MAX_ANCHOR_YEARS, atMost(MAX_ANCHOR_YEARS, 'anchor years'))
const drawsField = z
  .array(perAnchorList, { error: 'Enter a table of numbers.' })
  .max(MAX_UPLOADED_DRAWS, {
    error: `Use at most ${MAX_UPLOADED_DRAWS.toLocaleString('en')} draws; thin the draws evenly.`,
  })
  .refine(draws => draws.reduce((sum, row) => sum + row.length, 0) <= MAX_DRAW_VALUES, {
    error: `Use at most ${MAX_DRAW_VALUES.toLocaleString('en')} values in all (draws × anchor years); thin the draws or use fewer anchor years.`,
  })

const DOI_HINT = 'Enter a DOI like 10.1234/abcd, or leave it empty.'
const VERSION_HINT = 'Enter the version as a whole number from 1, or leave it out.'

export const provenanceFields = {
  method: text('method statement', MAX_TEXT.method),
  citation: text('citation', MAX_TEXT.citation),
  doi: z.union(
    [
      z
        .string()
        .trim()
        .max(200, { error: 'Use at most 200 characters.' })
        .regex(/^10\.\d{4,9}\/\S+$/, { error: DOI_HINT })
        .optional(),
      z.literal('').transform(() => undefined),
    ],
    { error: DOI_HINT },
  ),
  licence: text('licence', MAX_TEXT.licence),
}

export const NewSeriesSchema = z.object({
  component: componentField,
  scenario: scenarioField,
  title: text('series title', MAX_TEXT.title),
}, { error: 'Describe the new series as { component, scenario, title }.' })

/** The distribution part of a release as entered: numbers in `unit`, or a CSV table. */
export const ReleaseContentSchema = z.object({
  form: z.enum(RELEASE_FORMS, { error: `Choose one of: ${RELEASE_FORMS.join(', ')}.` }),
  unit: z.enum(AMOUNT_UNITS, { error: `Choose one of: ${AMOUNT_UNITS.join(', ')}.` }).default('m'),
  baselineYear: z.number({ error: 'Enter the baseline year (zero rise there).' }).int({ error: 'Enter a whole year.' }),
  anchorYears: anchorYearsField.optional(),
  mean: perAnchorList.optional(),
  sd: perAnchorList.optional(),
  shift: perAnchorList.optional(),
  mu: perAnchorList.optional(),
  sigma: perAnchorList.optional(),
  levels: levelsField.optional(),
  values: quantileValues.optional(),
  draws: drawsField.optional(),
  csv: z.string().optional(),
})

export const CreateReleaseSchema = ReleaseContentSchema.extend({
  seriesId: z.uuid({ error: 'Choose a series.' }).optional(),
  series: NewSeriesSchema.optional(),
  version: z.number({ error: VERSION_HINT }).int({ error: VERSION_HINT }).positive({ error: VERSION_HINT }).optional(),
  ...provenanceFields,
}).refine(body => Boolean(body.seriesId) !== Boolean(body.series), {
  error: 'Send either seriesId (a new version of a series) or series (a new series), not both.',
  path: ['seriesId'],
})

export const UpdateReleaseSchema = ReleaseContentSchema.extend(provenanceFields)

export const WithdrawSchema = z.object({
  reason: text('reason for withdrawal (it is shown wherever the record is referenced)', MAX_TEXT.reason),
})

export const ReturnSchema = z.object({
  note: text('note to the author saying what to change', MAX_TEXT.note),
})

export const ReleaseListQuery = z.object({
  component: componentField.optional(),
  scenario: scenarioField.optional(),
  state: z.enum(REVIEW_STATES).optional(),
  organisationId: z.uuid().optional(),
  seriesId: z.uuid().optional(),
})

export type ReleaseContentInput = z.infer<typeof ReleaseContentSchema>
export type CreateReleaseInput = z.infer<typeof CreateReleaseSchema>

export const CreateCorrelationSetSchema = z.object({
  scenario: scenarioField,
  title: text('title', MAX_TEXT.title),
  components: z
    .array(componentField, { error: 'List the components the matrix relates, in row order.' })
    .min(2, { error: 'A correlation set relates at least two components.' })
    .refine(keys => new Set(keys).size === keys.length, { error: 'Each component may appear only once.' }),
  // One row and column per component, and there are only so many components.
  matrix: z
    .array(numberList.max(COMPONENTS.length, atMost(COMPONENTS.length, 'columns')), {
      error: 'Enter a table of numbers.',
    })
    .max(COMPONENTS.length, atMost(COMPONENTS.length, 'rows')),
  version: z.number({ error: VERSION_HINT }).int({ error: VERSION_HINT }).positive({ error: VERSION_HINT }).optional(),
  /**
   * The series of releases each component's correlations were estimated for (component → series id).
   * A component left out takes the one published series of it under the scenario, preferring the
   * analyst's organisation's; when several are published the analyst must name one.
   */
  series: z
    .partialRecord(componentField, z.uuid({ error: 'Choose a published series from the list.' }), {
      error: 'Give the series per component.',
    })
    .optional(),
  ...provenanceFields,
})

export const CreateScaleFactorGridSchema = z.object({
  component: componentField,
  title: text('title', MAX_TEXT.title),
  latitudes: numberList.optional(),
  longitudes: numberList.optional(),
  factors: numberTable.optional(),
  /** Alternatively a CSV: header `latitude,<lon>,<lon>…`, one row per latitude. */
  csv: z.string().optional(),
  version: z.number({ error: VERSION_HINT }).int({ error: VERSION_HINT }).positive({ error: VERSION_HINT }).optional(),
  ...provenanceFields,
})

export type CreateCorrelationSetInput = z.infer<typeof CreateCorrelationSetSchema>
export type CreateScaleFactorGridInput = z.infer<typeof CreateScaleFactorGridSchema>

/** A storyline's values: a rise (metres) per anchor year for each component it names. */
export const CreateStorylineSchema = z
  .object({
    scenario: scenarioField,
    name: text('storyline name', MAX_TEXT.title),
    description: text('description of what the storyline supposes', MAX_TEXT.method),
    baselineYear: z
      .number({ error: 'Enter the baseline year (zero rise there).' })
      .int({ error: 'Enter a whole year.' })
      .min(1900, { error: 'Use a year from 1900.' })
      .max(2100, { error: 'Use a year up to 2100.' }),
    anchorYears: anchorYearsField
      .min(1, { error: 'Enter at least one anchor year.' })
      .refine(years => years.every((year, i) => i === 0 || year > years[i - 1]!), {
        error: 'List the anchor years in increasing order, each once.',
      }),
    values: z
      .partialRecord(
        componentField,
        perAnchorList.refine(list => list.every(v => Math.abs(v) <= 30), { error: 'Enter metres between −30 and 30.' }),
        { error: 'Give { component: [metres per anchor year] }.' },
      )
      .refine(values => Object.keys(values).length > 0, { error: 'Name at least one component and its values.' }),
    version: z
      .number({ error: VERSION_HINT })
      .int({ error: VERSION_HINT })
      .positive({ error: VERSION_HINT })
      .optional(),
    ...provenanceFields,
  })
  .superRefine((input, ctx) => {
    if (input.anchorYears[0] !== undefined && input.anchorYears[0] <= input.baselineYear) {
      ctx.addIssue({ code: 'custom', path: ['anchorYears'], message: 'Anchor years come after the baseline year.' })
    }
    for (const [component, list] of Object.entries(input.values)) {
      if (list && list.length !== input.anchorYears.length) {
        ctx.addIssue({
          code: 'custom',
          path: ['values', component],
          message: `Give one value per anchor year (${input.anchorYears.length}).`,
        })
      }
    }
  })

export type CreateStorylineInput = z.infer<typeof CreateStorylineSchema>
