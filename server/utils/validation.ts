import type { H3Event } from 'h3'
import type { z } from 'zod'
import { MAX_BODY_BYTES, parseJsonObject, type FieldIssue } from './json-body'

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

function isJson(contentType: string | undefined) {
  const type = (contentType ?? '').split(';')[0]!.trim().toLowerCase()
  return type === 'application/json' || /^application\/[\w.+-]+\+json$/.test(type)
}

function tooLarge(): never {
  throw createError({
    statusCode: 413,
    message: `The request is larger than ${MAX_BODY_BYTES / 1024 / 1024} MB. Send a smaller file (uploads are limited to 8 MB).`,
  })
}

/** The body as text, once its size and type are right: 413 past MAX_BODY_BYTES, 415 when not JSON. */
export async function readJsonText(event: H3Event): Promise<string | undefined> {
  if (Number(getRequestHeader(event, 'content-length') ?? 0) > MAX_BODY_BYTES) tooLarge()
  const raw = await readRawBody(event, 'utf8')
  if (raw && raw.length > MAX_BODY_BYTES) tooLarge()
  // Only JSON is read: a form post or plain text is refused rather than guessed at.
  if (raw && !isJson(getRequestHeader(event, 'content-type'))) {
    throw createError({
      statusCode: 415,
      message: 'body: Send the body as JSON, with the header Content-Type: application/json.',
      data: {
        issues: [{ field: 'body', message: 'Send the body as JSON, with the header Content-Type: application/json.' }],
      },
    })
  }
  return raw
}

/** The JSON body, parsed and validated; anything else is a 4xx that says what to fix. */
export async function readValidBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  const parsed = parseJsonObject(await readJsonText(event))
  if ('issues' in parsed) refuse(parsed.issues)
  const result = schema.safeParse(parsed.body)
  if (!result.success) refuse(fieldIssues(result.error))
  return result.data
}

/** 400 with these issues, worded as readValidBody words them. */
export function refuseIssues(issues: FieldIssue[]): never {
  refuse(issues)
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
