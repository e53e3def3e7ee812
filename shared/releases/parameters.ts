import type { z } from 'zod'
import type { ParsedRelease } from '../engine'
import type { lognormalReleaseSchema, normalReleaseSchema, quantileReleaseSchema } from '../engine/schema'

type Normal = z.output<typeof normalReleaseSchema>
type Lognormal = z.output<typeof lognormalReleaseSchema>
type Quantiles = z.output<typeof quantileReleaseSchema>

/**
 * A stored release's form-specific numbers in metres (`releases.parameters`). The form, baseline and
 * anchor years have columns of their own and draws a table of their own; which of these fields are
 * present follows the form.
 */
export type ReleaseParameters = Partial<
  Pick<Normal, 'mean' | 'sd'> & Pick<Lognormal, 'shift' | 'mu' | 'sigma'> & Pick<Quantiles, 'levels' | 'values'>
>

/** A release split into what `releases.parameters` stores and its draws (samples only, stored apart). */
export function splitRelease(release: ParsedRelease): { parameters: ReleaseParameters, draws: number[][] | null } {
  const { form: _form, baselineYear: _baseline, anchorYears: _anchors, ...rest } = release
  return 'draws' in rest ? { parameters: {}, draws: rest.draws } : { parameters: rest, draws: null }
}
