import { z } from 'zod'
import { DEFAULT_TOLERANCES, MAX_SAMPLES } from '../engine'
import { DATUM_KINDS, LAND_MOTION_SOURCES, THRESHOLD_KINDS } from '../types/science'
import { scenarioField } from './releases'
import { CSV_MAX_BYTES } from '../releases/limits'
import { textField } from './text'

// Coastal sites as a planner enters them. Heights are metres above the site's datum; rise is counted
// from the site's reference epoch; land motion is mm/yr with negative meaning the land sinks (which
// adds to the local rise).

const number = (what: string, min: number, max: number, unit: string) =>
  z.number({ error: `Enter the ${what} as a number.` })
    .min(min, { error: `The ${what} must be at least ${min} ${unit}.` })
    .max(max, { error: `The ${what} must be at most ${max} ${unit}.` })

const year = (what: string) =>
  z
    .number({ error: `Enter the ${what} as a year.` })
    .int({ error: 'Enter a whole year.' })
    .min(1900, { error: `The ${what} must be 1900 or later.` })
    .max(2100, { error: `The ${what} must be 2100 or earlier.` })

export const ThresholdSchema = z.object(
  {
    label: textField({ error: 'Name the threshold, like "Harbour wall crest".' })
      .trim()
      .min(1, { error: 'Name the threshold, like "Harbour wall crest".' })
      .max(120, { error: 'Use at most 120 characters.' }),
    height: number('height', -5, 20, 'm'),
    kind: z
      .enum(THRESHOLD_KINDS, {
        error: 'Say whether the height is for the mean sea level or a flood level (the total water level).',
      })
      .default('mean-sea-level'),
    buildYear: year('build year').nullable().optional(),
    designLifeYears: z
      .number({ error: 'Enter the design life in whole years, or leave it empty.' })
      .int({ error: 'Enter whole years.' })
      .min(1, { error: 'A design life is at least 1 year.' })
      .max(200, { error: 'A design life is at most 200 years.' })
      .nullable()
      .optional(),
  },
  { error: 'Enter each threshold as { label, height }.' },
)

export const MAX_THRESHOLDS = 12

/** A site plans for SSP2-4.5 and a 10 % tolerance until its planners choose otherwise. */
export const DEFAULT_PLANNING = { scenario: 'SSP2-4.5', tolerance: 0.1 } as const
/** The tolerances a planner may choose: those the engine gives trigger years for. */
export const PLANNING_TOLERANCES = DEFAULT_TOLERANCES

/** The scenario a site's lists, map and mails speak of, and the chance of passing a threshold its planners accept. */
export const PlanningSchema = z.object(
  {
    scenario: scenarioField,
    tolerance: z
      .number({ error: 'Choose the chance of passing a threshold you accept.' })
      .refine(value => PLANNING_TOLERANCES.some(t => Math.abs(t - value) < 1e-9), {
        error: `Choose one of: ${PLANNING_TOLERANCES.map(t => `${Math.round(t * 100)} %`).join(', ')}.`,
      }),
  },
  { error: 'Enter the planning scenario and tolerance as { scenario, tolerance }.' },
)

/** Bounds of extreme-water statistics, in metres above the datum: the form, the API and an upload's fit share them. */
export const GUMBEL_BOUNDS = { location: { min: -10, max: 20 }, scale: { max: 5 } } as const

const SiteFields = z.object({
  name: textField({ error: 'Enter the site name.' })
    .trim()
    .min(1, { error: 'Enter the site name.' })
    .max(120, { error: 'Use at most 120 characters.' }),
  latitude: number('latitude', -90, 90, 'degrees'),
  longitude: number('longitude', -180, 180, 'degrees'),
  referenceLevel: textField({ error: 'Say which level heights here are measured from.' })
    .trim()
    .min(1, {
      error:
        'Name the datum heights here are measured above, like "Harbour chart datum" or "mean sea level 1995–2014".',
    })
    .max(300, { error: 'Use at most 300 characters.' }),
  datum: z.object(
    {
      kind: z.enum(DATUM_KINDS, {
        error: 'Choose the kind of datum: mean sea level at an epoch, a land survey datum or a chart datum.',
      }),
      offset: z
        .number({
          error:
            'Enter how many metres mean sea level at the reference epoch stands above the datum (0 when the datum is that mean sea level).',
        })
        .min(-50, { error: 'The datum offset must be at least -50 m.' })
        .max(50, { error: 'The datum offset must be at most 50 m.' }),
    },
    { error: 'Enter the datum: its kind and its offset to mean sea level.' },
  ),
  referenceEpoch: year('reference epoch'),
  landMotion: z.object(
    {
      rateMmPerYear: number('land-motion rate', -100, 100, 'mm/yr'),
      sigmaMmPerYear: number('land-motion uncertainty', 0, 50, 'mm/yr'),
      source: z.enum(LAND_MOTION_SOURCES, { error: `Choose one of: ${LAND_MOTION_SOURCES.join(', ')}.` }),
      reference: textField({ error: 'Enter the source of the estimate as text, or leave it empty.' })
        .trim()
        .max(500, { error: 'Use at most 500 characters.' })
        .default(''),
      epoch: z
        .number({ error: 'Enter the reference year of the estimate.' })
        .int({ error: 'Enter a whole year.' })
        .min(1900, { error: 'The epoch must be 1900 or later.' })
        .max(2100, { error: 'The epoch must be 2100 or earlier.' }),
    },
    { error: 'Enter the land motion.' },
  ),
  thresholds: z
    .array(ThresholdSchema, { error: 'Send the thresholds as a list of { label, height }.' })
    .max(MAX_THRESHOLDS, { error: `At most ${MAX_THRESHOLDS} thresholds per site.` })
    .default([]),
  gumbel: z
    .object({
      location: number('Gumbel location', GUMBEL_BOUNDS.location.min, GUMBEL_BOUNDS.location.max, 'm'),
      scale: z
        .number({ error: 'Enter the Gumbel scale as a number.' })
        .positive({ error: 'The Gumbel scale must be above 0 m.' })
        .max(GUMBEL_BOUNDS.scale.max, { error: `The Gumbel scale must be at most ${GUMBEL_BOUNDS.scale.max} m.` }),
    })
    .nullable()
    .optional(),
  /** Left out, a new site plans for DEFAULT_PLANNING and an edited one keeps what it had. */
  planning: PlanningSchema.optional(),
})

type SiteFieldsInput = z.infer<typeof SiteFields>

/** Rules between fields: a life needs a build year on a flood level, and starts at or after the reference epoch. */
function checkThresholds(site: SiteFieldsInput, context: z.RefinementCtx) {
  site.thresholds.forEach((threshold, i) => {
    const issue = (field: string, message: string) =>
      context.addIssue({ code: 'custom', path: ['thresholds', i, field], message })
    const hasLife = threshold.designLifeYears != null
    const hasBuild = threshold.buildYear != null
    if (threshold.kind === 'mean-sea-level' && (hasLife || hasBuild)) {
      issue(
        hasLife ? 'designLifeYears' : 'buildYear',
        'A build year and design life belong to a flood level (the total water level over the asset\'s life); make this threshold a flood level or leave them empty.',
      )
    }
    if (hasLife && !hasBuild)
      issue('buildYear', 'Enter the year the asset starts to serve: its design life counts from then.')
    if (hasBuild && !hasLife)
      issue('designLifeYears', 'Enter the design life in years, or leave the build year empty too.')
    if (hasBuild && threshold.buildYear! < site.referenceEpoch) {
      issue(
        'buildYear',
        `The build year ${threshold.buildYear} is before the reference epoch ${site.referenceEpoch}; rise is counted from the epoch, so use a build year from ${site.referenceEpoch} on or an earlier epoch.`,
      )
    }
    if (threshold.kind === 'flood-level' && site.gumbel === null) {
      issue(
        'kind',
        'A flood level is compared with the total water level and needs the site\'s extreme-water statistics; enter them or make this a mean-sea-level threshold.',
      )
    }
  })
}

export const SiteSchema = SiteFields.superRefine(checkThresholds)

export const AnnualMaximaSchema = z.object({
  csv: z
    .string({ error: 'Upload a CSV of annual maxima with the columns year,value.' })
    .max(1_000_000, { error: 'The file is larger than 1 MB.' }),
})

export const GaugeRecordSchema = z.object({
  csv: z
    .string({ error: 'Upload a CSV of mean sea level with the columns year,height (or year,month,height).' })
    .max(1_000_000, { error: 'The file is larger than 1 MB.' }),
})

/** Land-motion draws as uploaded: the CSV, where the estimate comes from, and an optional joint release. */
export const LandMotionDrawsSchema = z.object({
  csv: z
    .string({ error: 'Upload a CSV of land-motion draws with the columns draw,rate_mm_per_year.' })
    .max(CSV_MAX_BYTES, { error: `The file is larger than ${CSV_MAX_BYTES / 1024 / 1024} MB.` }),
  source: z.enum(LAND_MOTION_SOURCES, { error: `Choose one of: ${LAND_MOTION_SOURCES.join(', ')}.` }),
  reference: textField({ error: 'Enter the source of the estimate as text, or leave it empty.' })
    .trim()
    .max(500, { error: 'Use at most 500 characters.' })
    .default(''),
  linkedReleaseId: z.uuid({ error: 'Choose a release from the list, or none.' }).nullable().default(null),
})
export type LandMotionDrawsUpload = z.output<typeof LandMotionDrawsSchema>

export const OutlookRequestSchema = z.object({
  scenario: scenarioField,
  samples: z
    .number({ error: 'Enter the number of samples.' })
    .int({ error: 'Enter a whole number of samples.' })
    .min(1000, { error: 'Use at least 1,000 samples.' })
    .max(MAX_SAMPLES, { error: `Use at most ${MAX_SAMPLES.toLocaleString('en')} samples.` })
    .default(100_000),
  seed: z
    .number({ error: 'Enter a whole-number seed.' })
    .int({ error: 'Enter a whole-number seed.' })
    .min(0, { error: 'The seed must be zero or more.' })
    .max(2 ** 31 - 1, { error: 'The seed must be below 2,147,483,648.' })
    .default(1),
  /** false: answer 202 at once and let the caller follow the progress; true: answer when done. */
  wait: z.boolean({ error: 'wait must be true or false.' }).default(true),
})

export type SiteInput = z.infer<typeof SiteSchema>
export type OutlookRequest = z.infer<typeof OutlookRequestSchema>
