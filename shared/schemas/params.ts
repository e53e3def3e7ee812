import { z } from 'zod'
import { SCENARIO_PATTERN } from '../types/science'

// Route parameters (the bracketed parts of a path under server/api, read with readValidParams) and
// the query parameters several routes share.

/** `[id]`: every record is named by a uuid. */
export const IdParams = z.object({ id: z.uuid() })

/** `[token]`: a briefing's share link. */
export const ShareTokenParams = z.object({ token: z.string().regex(/^[\w-]{20,64}$/) })

/** `?limit=`: how many of the newest lines a list shows, from 1 to `max`. */
export function LimitQuery(max: number, fallback: number) {
  const error = `Use a whole number from 1 to ${max}.`
  return z.object({
    limit: z.coerce.number({ error }).int({ error }).min(1, { error }).max(max, { error }).default(fallback),
  })
}

const MAX_SIGNAL_YEARS = 4
const signalYears = z
  .string()
  .regex(/^\d{4}(,\d{4})*$/, { error: 'List signal years as whole years separated by commas, like 2035,2045.' })
  .transform(text => [...new Set(text.split(',').map(Number))].sort((a, b) => a - b))
  .refine(years => years.length <= MAX_SIGNAL_YEARS, { error: `Give at most ${MAX_SIGNAL_YEARS} signal years.` })

/**
 * `GET /api/sites/[id]/signposts`: the decision after `measure` in `pathway` (the measure in service,
 * not the pathway's last), under `scenario` (the site's planning scenario when left out), with the
 * rate fitted by each of `years` (a few decades after the reference epoch when left out).
 */
export const SignpostsQuery = z.object({
  pathway: z.uuid({ error: 'Choose a pathway of this site (its id).' }),
  measure: z.uuid({ error: 'Choose the measure in service whose tipping the signal should foresee (its id).' }),
  scenario: z
    .string()
    .trim()
    .regex(SCENARIO_PATTERN, { error: 'Name a scenario with an outlook of this site, like SSP2-4.5.' })
    .optional(),
  years: signalYears.optional(),
  /** A flood-level measure tips when its chance in a year passes this (the pathway's first tolerance when left out). */
  tolerance: z.coerce
    .number({ error: 'Give the tolerance as a chance between 0.01 and 0.99, like 0.1 for 10 %.' })
    .min(0.01, { error: 'A tolerance is at least 0.01 (1 %).' })
    .max(0.99, { error: 'A tolerance is at most 0.99 (99 %).' })
    .optional(),
})
