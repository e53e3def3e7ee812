// The common rules of the shared zod schemas (shared/schemas/*.ts), recognised from the field and the
// English message the API gives, so the client can say them in the reader's language. A message that
// matches no rule is shown as the server wrote it.

export type IssueRule
  = | { rule: 'required' }
    | { rule: 'number' }
    | { rule: 'wholeYear' }
    | { rule: 'wholeNumber' }
    | { rule: 'choose' }
    | { rule: 'chooseSome' }
    | { rule: 'atLeast' | 'above' | 'atMost', limit: number, unit: string }
    | { rule: 'tooLong', limit: number }

/** A value the planner left blank: '' in the form, null or NaN in the request. */
export function isBlank(value: unknown): boolean {
  return value === undefined || value === null || value === '' || (typeof value === 'number' && Number.isNaN(value))
}

const bound = (rule: 'atLeast' | 'above' | 'atMost', match: RegExpMatchArray): IssueRule =>
  ({ rule, limit: Number(match[1]), unit: (match[2] ?? '').trim() })

/**
 * The rule behind a message, given the value the field held when it was sent. A blank field is
 * "required" whatever the schema's wording of the type error, unless the message explains more than
 * that (a colon, or "leave it empty").
 */
export function issueRule(message: string, value: unknown): IssueRule | null {
  if (isBlank(value) && /^(Enter|Name|Choose|Say) /.test(message) && !/:|leave/.test(message))
    return { rule: 'required' }
  let match: RegExpMatchArray | null
  if (/^Choose (one of|the kind)/.test(message)) return { rule: 'choose' }
  // A list of boxes left with none ticked (the briefing's thresholds and years).
  if (/^Choose at least one \w+\.$/.test(message)) return { rule: 'chooseSome' }
  if (/ as a number\.$|^Enter a number\b/.test(message)) return { rule: 'number' }
  if (/ as a year\.$|^Enter a whole year\.$|^Enter whole years\.$/.test(message)) return { rule: 'wholeYear' }
  if (/^Enter (whole|a whole-number|the design life in whole)/.test(message)) return { rule: 'wholeNumber' }
  if ((match = message.match(/ must be (\d{4}) or later\.$/))) return bound('atLeast', match)
  if ((match = message.match(/ must be (\d{4}) or earlier\.$/))) return bound('atMost', match)
  if ((match = message.match(/ (?:must be|is) at least (-?\d+(?:\.\d+)?) ?([^.]*)\.$/))) return bound('atLeast', match)
  if ((match = message.match(/ must be above (-?\d+(?:\.\d+)?) ?([^.]*)\.$/))) return bound('above', match)
  if ((match = message.match(/ (?:must be|is) at most (-?\d+(?:\.\d+)?) ?([^.]*)\.$/))) return bound('atMost', match)
  if ((match = message.match(/^Use at most (\d+) characters\.$/))) return { rule: 'tooLong', limit: Number(match[1]) }
  return null
}

/** The path into the request body an issue's field names: "values[0]" and "values.0" alike; "csv row 3" is the csv. */
export function issuePath(field: string): string[] {
  return field.split(/[ ,]/)[0]!.replace(/\[(\d+)\]/g, '.$1').split('.').filter(Boolean)
}

/** The value at a path, or undefined where the body has nothing there. */
export function valueAt(body: unknown, path: string[]): unknown {
  let here = body
  for (const key of path) {
    if (here === null || typeof here !== 'object') return undefined
    here = (here as Record<string, unknown>)[key]
  }
  return here
}
