// The product's vocabulary for published science (see DEVELOPERS.md).

export const COMPONENTS = [
  'ocean-expansion',
  'glaciers',
  'greenland',
  'antarctica',
  'land-water',
  'regional-ocean',
  'other',
] as const
export type ComponentKey = typeof COMPONENTS[number]

/** IPCC scenario names offered first; analysts may also name a storyline of their own. */
export const KNOWN_SCENARIOS = ['SSP1-1.9', 'SSP1-2.6', 'SSP2-4.5', 'SSP3-7.0', 'SSP5-8.5'] as const
export const SCENARIO_PATTERN = /^[A-Za-z0-9][\w .+-]{1,39}$/

export const RELEASE_FORMS = ['normal', 'lognormal', 'quantiles', 'samples'] as const
export type ReleaseForm = typeof RELEASE_FORMS[number]

/** draft → in-review → published → superseded | withdrawn (in-review may also return to draft). */
export const REVIEW_STATES = ['draft', 'in-review', 'published', 'superseded', 'withdrawn'] as const
export type ReviewState = typeof REVIEW_STATES[number]

/** States anyone may read: they were published once. */
export const PUBLIC_STATES: readonly ReviewState[] = ['published', 'superseded', 'withdrawn']

/** How amounts are entered; everything is stored in metres of global mean rise. */
export const AMOUNT_UNITS = ['m', 'mm', 'Gt'] as const
export type AmountUnit = typeof AMOUNT_UNITS[number]

/** Where a land-motion estimate comes from. */
export const LAND_MOTION_SOURCES = ['gps', 'insar', 'model', 'other'] as const
export type LandMotionSource = typeof LAND_MOTION_SOURCES[number]

/**
 * What a site's heights are measured above: mean sea level at an epoch, a land survey (levelling)
 * datum, or a chart datum. Each carries its offset to mean sea level at the site's reference epoch.
 */
export const DATUM_KINDS = ['mean-sea-level', 'land-survey', 'chart'] as const
export type DatumKind = typeof DATUM_KINDS[number]

/**
 * A mean-sea-level threshold is a height the mean sea level may pass; a flood level is a height of the
 * total water level (a crest, a floor, a road), reached by the annual maxima on top of the mean.
 */
export const THRESHOLD_KINDS = ['mean-sea-level', 'flood-level'] as const
export type ThresholdKind = typeof THRESHOLD_KINDS[number]

export const OUTLOOK_STATES = ['running', 'done', 'failed'] as const
export type OutlookState = typeof OUTLOOK_STATES[number]
