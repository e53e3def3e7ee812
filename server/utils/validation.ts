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

// Big enough for the largest CSV upload inside a JSON body, small enough to refuse abuse early.
export const MAX_BODY_BYTES = 12 * 1024 * 1024

function tooLarge(): never {
  throw createError({ statusCode: 413, message: `The request is larger than ${MAX_BODY_BYTES / 1024 / 1024} MB. Send a smaller file (uploads are limited to 8 MB).` })
}

/** The JSON body, parsed and validated; anything else is a 4xx that says what to fix. */
export async function readValidBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  if (Number(getRequestHeader(event, 'content-length') ?? 0) > MAX_BODY_BYTES) tooLarge()
  const raw = await readRawBody(event, 'utf8')
  if (raw && raw.length > MAX_BODY_BYTES) tooLarge()
  let body: unknown
  try {
    body = raw ? JSON.parse(raw) : undefined
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

/** Query parameters, validated; a bad filter is a 400 naming the parameter. */
export function readValidQuery<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  const result = schema.safeParse(getQuery(event))
  if (!result.success) refuse(fieldIssues(result.error))
  return result.data
}
