import { EngineInputError, validateRelease, type ParsedRelease } from '../engine'
import type { ReleaseContentInput } from '../schemas/releases'
import { amountToMetres } from './amounts'
import { CsvError, parseDrawsCsv, parseQuantileCsv } from './csv'

export interface ContentIssue { field: string, message: string }

/** A release that cannot be built: each issue names the field (or CSV row and column) to fix. */
export class ReleaseContentError extends Error {
  constructor(readonly issues: ContentIssue[]) {
    super(issues.map(issue => `${issue.field}: ${issue.message}`).join(' '))
    this.name = 'ReleaseContentError'
  }
}

const convert = (values: number[] | undefined, unit: ReleaseContentInput['unit']) =>
  values?.map(v => amountToMetres(v, unit))

/**
 * Turns what an analyst entered (numbers in m, mm or Gt, or a CSV table) into a release in metres,
 * checked by the engine's own rules. Throws ReleaseContentError.
 */
export function buildRelease(input: ReleaseContentInput): ParsedRelease {
  const { form, unit, baselineYear } = input
  let anchorYears = input.anchorYears
  let { levels, values, draws } = input
  try {
    if (input.csv !== undefined && form === 'quantiles') ({ anchorYears, levels, values } = parseQuantileCsv(input.csv))
    else if (input.csv !== undefined && form === 'samples') ({ anchorYears, draws } = parseDrawsCsv(input.csv))
    else if (input.csv !== undefined)
      throw new ReleaseContentError([
        {
          field: 'csv',
          message: 'CSV upload is for quantile tables and draws; enter normal and lognormal parameters in the form.',
        },
      ])
  }
  catch (error) {
    if (error instanceof CsvError) throw new ReleaseContentError(error.issues)
    throw error
  }
  if (form === 'lognormal' && unit !== 'm') {
    throw new ReleaseContentError([
      {
        field: 'unit',
        message: 'Enter lognormal parameters in metres: mu and sigma are on a log scale and do not convert.',
      },
    ])
  }

  const candidate = {
    form,
    baselineYear,
    anchorYears,
    mean: convert(input.mean, unit),
    sd: convert(input.sd, unit),
    shift: input.shift,
    mu: input.mu,
    sigma: input.sigma,
    levels,
    values: values?.map(row => row.map(v => amountToMetres(v, unit))),
    draws: draws?.map(row => row.map(v => amountToMetres(v, unit))),
  }
  try {
    return validateRelease(candidate, '')
  }
  catch (error) {
    if (error instanceof EngineInputError) {
      throw new ReleaseContentError(
        error.issues.map(issue => ({ field: issue.path || 'release', message: issue.message })),
      )
    }
    throw error
  }
}
