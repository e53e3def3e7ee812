import { z } from 'zod'
import { MAX_SAMPLES } from '../engine'
import { LAND_MOTION_SOURCES } from '../types/science'
import { scenarioField } from './releases'

// Coastal sites as a planner enters them. Heights are metres above the site's reference level;
// land motion is mm/yr with negative meaning the land sinks (which adds to the local rise).

const number = (what: string, min: number, max: number, unit: string) =>
  z.number({ error: `Enter the ${what} as a number.` })
    .min(min, { error: `The ${what} must be at least ${min} ${unit}.` })
    .max(max, { error: `The ${what} must be at most ${max} ${unit}.` })

export const ThresholdSchema = z.object({
  label: z.string({ error: 'Name the threshold, like "Harbour wall crest".' }).trim()
    .min(1, { error: 'Name the threshold, like "Harbour wall crest".' }).max(120, { error: 'Use at most 120 characters.' }),
  height: number('height', -5, 20, 'm'),
  designLifeYears: z.number({ error: 'Enter the design life in whole years, or leave it empty.' }).int({ error: 'Enter whole years.' }).min(1, { error: 'A design life is at least 1 year.' })
    .max(200, { error: 'A design life is at most 200 years.' }).nullable().optional(),
}, { error: 'Enter each threshold as { label, height }.' })

export const MAX_THRESHOLDS = 12

export const SiteSchema = z.object({
  name: z.string({ error: 'Enter the site name.' }).trim().min(1, { error: 'Enter the site name.' }).max(120, { error: 'Use at most 120 characters.' }),
  latitude: number('latitude', -90, 90, 'degrees'),
  longitude: number('longitude', -180, 180, 'degrees'),
  referenceLevel: z.string({ error: 'Say which level heights here are measured from.' }).trim()
    .min(1, { error: 'Say which level heights here are measured from, like "local chart datum" or "mean sea level 2000–2019".' })
    .max(300, { error: 'Use at most 300 characters.' }),
  landMotion: z.object({
    rateMmPerYear: number('land-motion rate', -100, 100, 'mm/yr'),
    sigmaMmPerYear: number('land-motion uncertainty', 0, 50, 'mm/yr'),
    source: z.enum(LAND_MOTION_SOURCES, { error: `Choose one of: ${LAND_MOTION_SOURCES.join(', ')}.` }),
    reference: z.string({ error: 'Enter the source of the estimate as text, or leave it empty.' }).trim().max(500, { error: 'Use at most 500 characters.' }).default(''),
    epoch: z.number({ error: 'Enter the reference year of the estimate.' }).int({ error: 'Enter a whole year.' })
      .min(1900, { error: 'The epoch must be 1900 or later.' }).max(2100, { error: 'The epoch must be 2100 or earlier.' }),
  }, { error: 'Enter the land motion.' }),
  thresholds: z.array(ThresholdSchema, { error: 'Send the thresholds as a list of { label, height }.' }).max(MAX_THRESHOLDS, { error: `At most ${MAX_THRESHOLDS} thresholds per site.` }).default([]),
  gumbel: z.object({
    location: number('Gumbel location', -10, 20, 'm'),
    scale: z.number({ error: 'Enter the Gumbel scale as a number.' }).positive({ error: 'The Gumbel scale must be above 0 m.' }).max(5, { error: 'The Gumbel scale must be at most 5 m.' }),
  }).nullable().optional(),
})

export const AnnualMaximaSchema = z.object({
  csv: z.string({ error: 'Upload a CSV of annual maxima with the columns year,value.' }).max(1_000_000, { error: 'The file is larger than 1 MB.' }),
})

export const MIN_ANNUAL_MAXIMA = 10

export const OutlookRequestSchema = z.object({
  scenario: scenarioField,
  samples: z.number({ error: 'Enter the number of samples.' }).int({ error: 'Enter a whole number of samples.' })
    .min(1000, { error: 'Use at least 1,000 samples.' })
    .max(MAX_SAMPLES, { error: `Use at most ${MAX_SAMPLES.toLocaleString('en')} samples.` }).default(100_000),
  seed: z.number({ error: 'Enter a whole-number seed.' }).int({ error: 'Enter a whole-number seed.' }).min(0, { error: 'The seed must be zero or more.' }).max(2 ** 31 - 1, { error: 'The seed must be below 2,147,483,648.' }).default(1),
  /** false: answer 202 at once and let the caller follow the progress; true: answer when done. */
  wait: z.boolean({ error: 'wait must be true or false.' }).default(true),
})

export type SiteInput = z.infer<typeof SiteSchema>
export type OutlookRequest = z.infer<typeof OutlookRequestSchema>
