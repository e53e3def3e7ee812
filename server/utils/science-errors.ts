import { ReleaseContentError } from '#shared/releases/content'
import { CsvError } from '#shared/releases/csv'
import { EngineInputError } from '#shared/engine'

/** Runs a build step and turns its refusal into a 400 whose message names each field to fix. */
export function asBadRequest<T>(build: () => T): T {
  try {
    return build()
  }
  catch (error) {
    const issues = error instanceof ReleaseContentError || error instanceof CsvError
      ? error.issues
      : error instanceof EngineInputError
        ? error.issues.map(issue => ({ field: issue.path || 'body', message: issue.message }))
        : undefined
    if (!issues) throw error
    throw createError({
      statusCode: 400,
      message: issues.map(issue => `${issue.field}: ${issue.message}`).join(' '),
      data: { issues },
    })
  }
}
