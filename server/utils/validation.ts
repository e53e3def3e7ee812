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

// Deeper than any form of ours; refusing it early keeps hostile nesting away from the schemas.
export const MAX_JSON_DEPTH = 32

/**
 * The first thing in a parsed body the database cannot store or no form can send: a NUL character
 * (PostgreSQL text refuses it), an unpaired UTF-16 surrogate (not valid UTF-8 nor valid jsonb), or
 * nesting beyond MAX_JSON_DEPTH. Walked without recursion, so depth itself cannot overflow the stack.
 */
export function unstorableText(body: unknown): FieldIssue | undefined {
  const stack: Array<{ value: unknown, path: string[] }> = [{ value: body, path: [] }]
  const field = (path: string[]) => path.length ? path.join('.') : 'body'
  const textIssue = (text: string, path: string[]): FieldIssue | undefined => {
    if (text.includes('\u0000')) return { field: field(path), message: 'Remove the NUL character (\\u0000): text cannot contain it.' }
    if (!text.isWellFormed()) return { field: field(path), message: 'The text has a broken character (an unpaired UTF-16 surrogate); type or paste it again.' }
    return undefined
  }
  while (stack.length) {
    const { value, path } = stack.pop()!
    if (typeof value === 'string') {
      const issue = textIssue(value, path)
      if (issue) return issue
      continue
    }
    if (value === null || typeof value !== 'object') continue
    if (path.length >= MAX_JSON_DEPTH) return { field: field(path), message: `The JSON is nested more than ${MAX_JSON_DEPTH} levels deep; send the fields of this form only.` }
    for (const [key, child] of Object.entries(value)) {
      const issue = textIssue(key, path)
      if (issue) return { ...issue, message: `A field name: ${issue.message}` }
      // Numbers, booleans and nulls need no look (a 100,000-draw upload is mostly numbers).
      if (typeof child === 'string' || (child !== null && typeof child === 'object')) stack.push({ value: child, path: [...path, key] })
    }
  }
  return undefined
}

function isJson(contentType: string | undefined) {
  const type = (contentType ?? '').split(';')[0]!.trim().toLowerCase()
  return type === 'application/json' || /^application\/[\w.+-]+\+json$/.test(type)
}

function tooLarge(): never {
  throw createError({ statusCode: 413, message: `The request is larger than ${MAX_BODY_BYTES / 1024 / 1024} MB. Send a smaller file (uploads are limited to 8 MB).` })
}

/** The JSON body, parsed and validated; anything else is a 4xx that says what to fix. */
export async function readValidBody<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  if (Number(getRequestHeader(event, 'content-length') ?? 0) > MAX_BODY_BYTES) tooLarge()
  const raw = await readRawBody(event, 'utf8')
  if (raw && raw.length > MAX_BODY_BYTES) tooLarge()
  // Only JSON is read: a form post or plain text is refused rather than guessed at.
  if (raw && !isJson(getRequestHeader(event, 'content-type'))) {
    throw createError({ statusCode: 415, message: 'body: Send the body as JSON, with the header Content-Type: application/json.', data: { issues: [{ field: 'body', message: 'Send the body as JSON, with the header Content-Type: application/json.' }] } })
  }
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
  const unstorable = unstorableText(body)
  if (unstorable) refuse([unstorable])
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
