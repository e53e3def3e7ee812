import type { z } from 'zod'

// Reading a JSON body, without anything of the server around it, so the release worker
// (server/workers/release-worker.ts) can parse and check a large body off the request thread
// exactly as readValidBody (server/utils/validation.ts) does on it.

export interface FieldIssue { field: string, message: string }

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
    if (text.includes('\u0000'))
      return { field: field(path), message: 'Remove the NUL character (\\u0000): text cannot contain it.' }
    if (!text.isWellFormed())
      return {
        field: field(path),
        message: 'The text has a broken character (an unpaired UTF-16 surrogate); type or paste it again.',
      }
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
    if (path.length >= MAX_JSON_DEPTH)
      return {
        field: field(path),
        message: `The JSON is nested more than ${MAX_JSON_DEPTH} levels deep; send the fields of this form only.`,
      }
    for (const [key, child] of Object.entries(value)) {
      const issue = textIssue(key, path)
      if (issue) return { ...issue, message: `A field name: ${issue.message}` }
      // Numbers, booleans and nulls need no look (a 100,000-draw upload is mostly numbers).
      if (typeof child === 'string' || (child !== null && typeof child === 'object'))
        stack.push({ value: child, path: [...path, key] })
    }
  }
  return undefined
}

/** A request body as an object, or the issue a person can act on: not JSON, not an object, unstorable. */
export function parseJsonObject(raw: string | undefined): { body: Record<string, unknown> } | { issues: FieldIssue[] } {
  let body: unknown
  try {
    body = raw ? JSON.parse(raw) : undefined
  }
  catch {
    return { issues: [{ field: 'body', message: 'The request body is not valid JSON. Send a JSON object.' }] }
  }
  if (body === null || typeof body !== 'object' || Array.isArray(body)) {
    return { issues: [{ field: 'body', message: 'Send a JSON object with the fields of this form.' }] }
  }
  const unstorable = unstorableText(body)
  if (unstorable) return { issues: [unstorable] }
  return { body: body as Record<string, unknown> }
}

/** Zod issues as "field: what to fix" lines, the form both the API message and the UI show. */
export function zodFieldIssues(error: z.ZodError): FieldIssue[] {
  return error.issues.map(issue => ({
    field: issue.path.length ? issue.path.map(String).join('.') : 'body',
    message: issue.message,
  }))
}
