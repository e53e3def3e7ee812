import { languageTag, translator, type Translate, type WordParams } from './translate'

// What is wrong with an uploaded file (a release's CSV, annual maxima, a gauge record, a grid) is kept
// as facts: a code from locales/<lang>/uploads.json and its values. The API sends them with each issue
// beside the English sentence, and a page words them in its reader's language.

/** The facts of an upload issue; `advice`, when given, is itself a code (`uploads.advice.*`). */
export interface UploadIssueFacts { code: string, params?: WordParams }

/**
 * An upload issue in one language. Numbers are written as that language writes them, grouped only from
 * five digits, so a year stays 1998 while a count reads 100,000 (100 000 in Spanish).
 */
export function uploadIssueMessage(t: Translate, { code, params = {} }: UploadIssueFacts): string {
  const number = new Intl.NumberFormat(languageTag(t.language), { useGrouping: 'min2', maximumFractionDigits: 6 })
  const worded: WordParams = {}
  for (const [name, value] of Object.entries(params))
    worded[name] = typeof value === 'number' ? number.format(value) : value
  if (typeof params.advice === 'string') worded.advice = t(`uploads.advice.${params.advice}`)
  return t(`uploads.${code}`, worded)
}

const english = translator('en')

/** An issue of an uploaded file for the API: the field, the facts, and the English sentence. */
export function uploadIssue(field: string, code: string, params: WordParams = {}) {
  return { field, code, params, message: uploadIssueMessage(english, { code, params }) }
}
