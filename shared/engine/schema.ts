import { z } from 'zod'
import { MAX_SEED } from './rng'

// Shapes and per-field rules of an outlook request. Rules that relate fields to each other (anchor
// years against output years, matrix properties) live in validate.ts, where the messages can name
// both sides.

export const MAX_SAMPLES = 2_000_000
export const DEFAULT_TOLERANCES = [0.01, 0.05, 0.1, 0.33, 0.5] as const
export const DEFAULT_RETURN_PERIODS = [10, 50, 100] as const

const year = z
  .number()
  .int('must be a whole year')
  .min(1000, 'must be a year from 1000')
  .max(9999, 'must be a year before 10000')
// Bounds keep every product and sum in the engine finite; no real rise, rate or scale comes near them.
const MAX_METRES = 1000
const finite = z
  .number()
  .min(-MAX_METRES, `must be at least -${MAX_METRES}`)
  .max(MAX_METRES, `must be at most ${MAX_METRES}`)
const nonNegative = z.number().min(0, 'must be zero or more').max(MAX_METRES, `must be at most ${MAX_METRES}`)
export const MAX_DRAWS = 200_000
export const MAX_HEIGHTS = 10_000
const perAnchor = (what: string, item: z.ZodNumber = finite) =>
  z.array(item).min(1, `needs one ${what} per anchor year`)

const releaseBase = {
  baselineYear: year.describe('year at which this release gives zero rise'),
  anchorYears: z.array(year).min(1, 'needs at least one anchor year'),
}

export const normalReleaseSchema = z.object({
  form: z.literal('normal'),
  ...releaseBase,
  mean: perAnchor('mean'),
  sd: perAnchor('standard deviation', nonNegative),
})

export const lognormalReleaseSchema = z.object({
  form: z.literal('lognormal'),
  ...releaseBase,
  shift: perAnchor('shift'),
  mu: perAnchor(
    'mu',
    z.number().min(-50, 'must be at least -50').max(20, 'must be at most 20 (e^20 m is no sea level)'),
  ),
  sigma: perAnchor('sigma', z.number().min(0, 'must be zero or more').max(3, 'must be at most 3')),
})

export const quantileReleaseSchema = z.object({
  form: z.literal('quantiles'),
  ...releaseBase,
  levels: z.array(z.number()).min(3, 'needs at least 3 probability levels').max(999, 'must have at most 999 levels'),
  values: z.array(z.array(finite)).min(1, 'needs one row of values per anchor year'),
})

export const samplesReleaseSchema = z.object({
  form: z.literal('samples'),
  ...releaseBase,
  draws: z
    .array(z.array(finite))
    .min(1, 'needs at least one draw (one row per draw, one value per anchor year)')
    .max(MAX_DRAWS, `must have at most ${MAX_DRAWS} draws`),
})

export const releaseSchema = z.discriminatedUnion('form', [
  normalReleaseSchema,
  lognormalReleaseSchema,
  quantileReleaseSchema,
  samplesReleaseSchema,
])

export const componentSchema = z.object({
  key: z.string().min(1, 'must be a non-empty component key'),
  scale: z.number().min(-100, 'must be at least -100').max(100, 'must be at most 100').default(1),
  release: releaseSchema,
})

/**
 * Vertical land motion in mm/yr (positive: the land rises). A normal (rate, sigma), or posterior `draws`
 * of the rate, which then take the normal's place: picked by the land-motion score like a release's
 * draws, or, with `jointWith` naming a component whose release is draws of the same count, the draw with
 * the index of the release draw each sample picked (validate.ts checks the link).
 */
export const landMotionSchema = z.object({
  rateMmPerYear: finite.optional(),
  sigmaMmPerYear: nonNegative.default(0),
  epoch: year,
  draws: z
    .array(finite)
    .min(1, 'needs at least one land-motion draw (mm/yr)')
    .max(MAX_DRAWS, `must have at most ${MAX_DRAWS} draws`)
    .optional(),
  jointWith: z.string().min(1, 'must name a component key').optional(),
})

export const heightRangeSchema = z.object({
  from: finite,
  to: finite,
  step: z.number().positive('must be a positive step in metres'),
})

export const THRESHOLD_KINDS = ['mean-sea-level', 'flood-level'] as const
export const DEFAULT_DESIGN_LIFE_CHANCE = 0.1

/**
 * A height in metres above mean sea level at the outlook's baseline year. A `mean-sea-level` threshold is
 * compared with the rise, a `flood-level` with the total water level (annual maximum plus rise).
 */
export const thresholdSchema = z.object({
  key: z.string().min(1).optional(),
  height: finite,
  kind: z.enum(THRESHOLD_KINDS).default('mean-sea-level'),
  designLifeYears: z.number().int('must be a whole number of years').positive('must be at least 1 year').optional(),
  /** First year of the asset's life (its build year); required with designLifeYears. */
  lifeStartYear: year.optional(),
  /** Chance of at least one exceedance during the life that the design-life level is defined by. */
  designLifeChance: z
    .number()
    .gt(0, 'must be a chance above 0')
    .lt(1, 'must be a chance below 1')
    .default(DEFAULT_DESIGN_LIFE_CHANCE),
})

export const gumbelSchema = z.object({
  location: finite,
  scale: z.number().positive('must be a positive Gumbel scale in metres'),
  returnPeriods: z
    .array(z.number().gt(1, 'must be a return period above 1 year'))
    .default([...DEFAULT_RETURN_PERIODS]),
  /** Standard errors of the fitted location and scale (metres): each trajectory then draws its own pair. */
  locationSe: nonNegative.optional(),
  scaleSe: nonNegative.optional(),
  /** Correlation of the location and scale estimates (default 0). */
  locationScaleCorrelation: z.number().min(-1, 'must be at least -1').max(1, 'must be at most 1').optional(),
})

/**
 * An observed record of mean sea level since the baseline year, for likelihood weighting of the
 * trajectories (`observation-plan.ts`): each value is metres of rise relative to mean sea level at the
 * baseline year, with the tidal cycles (nodal, seasonal) already taken out, at a decimal time (the middle
 * of its interval). Residuals about a trajectory follow AR(1) with lag-one correlation `phi` per step of
 * `stepYears` and marginal standard deviation `residualSd`. An empty record gives no update.
 */
export const observationsSchema = z.object({
  times: z.array(z.number().min(1000, 'must be a year from 1000').max(9999, 'must be a year before 10000')),
  rise: z.array(finite),
  residualSd: z.number().positive('must be a positive standard deviation in metres').max(MAX_METRES),
  phi: z.number().gt(-1, 'must be above -1').lt(1, 'must be below 1'),
  stepYears: z.number().positive('must be a positive step in years').max(1, 'must be at most one year').default(1),
  /**
   * How far ahead the record is read: `record-length` (the default) tapers the update to the outlook's own
   * numbers over as many years after the record as it spans; `whole-outlook` carries it to every year.
   */
  reach: z.enum(['record-length', 'whole-outlook']).default('record-length'),
})

export const outlookInputSchema = z.object({
  baselineYear: year,
  years: z.array(year).min(1, 'needs at least one output year'),
  samples: z
    .number()
    .int('must be a whole number of samples')
    .min(1, 'must be at least 1')
    .max(MAX_SAMPLES, `must be at most ${MAX_SAMPLES.toLocaleString('en')}`),
  seed: z.number().int('must be a whole number').min(0, 'must be zero or more').max(MAX_SEED, 'must be a safe integer'),
  components: z.array(componentSchema).min(1, 'needs at least one component'),
  correlation: z.array(z.array(finite)).optional(),
  landMotion: landMotionSchema.optional(),
  heights: z.union([z.array(finite).min(1, 'needs at least one height'), heightRangeSchema]),
  thresholds: z.array(thresholdSchema).default([]),
  tolerances: z
    .array(z.number().gt(0, 'must be above 0').lt(1, 'must be below 1'))
    .default([...DEFAULT_TOLERANCES]),
  gumbel: gumbelSchema.optional(),
  observations: observationsSchema.optional(),
})

/** What a caller passes (defaults may be omitted). */
export type OutlookInput = z.input<typeof outlookInputSchema>
/** The same after defaults are filled in. */
export type ParsedOutlookInput = z.output<typeof outlookInputSchema>
export type ReleaseInput = z.input<typeof releaseSchema>
export type ParsedRelease = z.output<typeof releaseSchema>
export type ComponentInput = z.input<typeof componentSchema>
export type LandMotionInput = z.input<typeof landMotionSchema>
export type ThresholdInput = z.input<typeof thresholdSchema>
export type GumbelInput = z.input<typeof gumbelSchema>
export type ObservationsInput = z.input<typeof observationsSchema>
