import type { H3Event } from 'h3'
import type { z } from 'zod'

export interface FieldIssue { field: string, message: string }

/** Zod issues as "field: what to fix" lines, the form both the API message and the UI show. */
export function fieldIssues(error: z.ZodError): FieldIssue[] {
  return error.issues.map(issue => ({
    field: issue.path.length ? issue.path.map(String).join('.') : 'body',
    message: issue.message,
  }))
}

function refuse(issues: FieldIssue[]): never {
  throw createError({
    statusCode: 400,
    message: issues.map(issue => `${issue.field}: ${issue.message}`).join(' '),
    data: { issues },
  })
}

/** The JSON body, parsed and validated; anything else is a 400 that says what to fix. */
export async function readValidBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  let body: unknown
  try {
    body = await readBody(event)
  }
  catch {
    refuse([{ field: 'body', message: 'The request body is not valid JSON. Send a JSON object.' }])
  }
  if (body === null || typeof body !== 'object' || Array.isArray(body)) {
    refuse([{ field: 'body', message: 'Send a JSON object with the fields of this form.' }])
  }
  const result = schema.safeParse(body)
  if (!result.success) refuse(fieldIssues(result.error))
  return result.data
}

export function readValidParams<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  const result = schema.safeParse(event.context.params ?? {})
  // A malformed id cannot name any record: answer as for a missing one.
  if (!result.success) throw createError({ statusCode: 404, message: 'No such record.' })
  return result.data
}
