import type { AmountUnit, ReleaseForm } from '#shared/types/science'
import type { WordParams } from '#shared/wording/translate'
import { releaseCsv } from '#shared/releases/export'

// The release editor's model. Numbers are kept as the text typed, so a half-typed value is never
// lost; they become numbers only in the request, where the server names anything unreadable.

export interface DraftModel {
  component: string
  scenario: string
  title: string
  form: ReleaseForm
  unit: AmountUnit
  baselineYear: string
  anchorYears: string[]
  mean: string[]
  sd: string[]
  shift: string[]
  mu: string[]
  sigma: string[]
  levels: string[]
  /** values[anchor][level], the engine's layout. */
  values: string[][]
  /** An uploaded table (quantiles or draws), sent as it is; it replaces the grid while present. */
  csv: string | null
  csvName: string
  method: string
  citation: string
  doi: string
  licence: string
}

/**
 * An API issue; `label`, once the client has worded it, is the field's visible label ('' for none).
 * An uploaded file's issues carry their facts too (`code`, `params`: shared/wording/uploads.ts).
 */
export interface FieldIssue { field: string, message: string, label?: string, code?: string, params?: WordParams }

const PER_ANCHOR = ['mean', 'sd', 'shift', 'mu', 'sigma'] as const
const DEFAULT_LEVELS = ['0.05', '0.17', '0.5', '0.83', '0.95']

export function blankDraft(): DraftModel {
  const anchors = ['2050', '2100']
  const empty = () => anchors.map(() => '')
  return {
    component: '', scenario: '', title: '', form: 'quantiles', unit: 'm', baselineYear: '2020', anchorYears: anchors,
    mean: empty(), sd: empty(), shift: empty(), mu: empty(), sigma: empty(),
    levels: [...DEFAULT_LEVELS], values: anchors.map(() => DEFAULT_LEVELS.map(() => '')),
    csv: null, csvName: '', method: '', citation: '', doi: '', licence: '',
  }
}

/** Short, exact text for a stored number (no binary noise like 0.30000000000000004). */
const show = (value: number) => String(Number(value.toPrecision(10)))

interface StoredRelease {
  form: ReleaseForm
  distribution: { baselineYear: number, anchorYears: number[], form: string, [key: string]: unknown }
  method: string
  citation: string
  doi: string | null
  licence: string
}

/** A stored release (metres) as editor text: for editing a draft or starting the next version. */
export function draftFromRelease(release: StoredRelease, csvName: string): DraftModel {
  const d = release.distribution
  const draft = blankDraft()
  const list = (key: string) => (d[key] as number[] | undefined)?.map(show) ?? d.anchorYears.map(() => '')
  Object.assign(draft, {
    form: release.form, unit: 'm', baselineYear: String(d.baselineYear), anchorYears: d.anchorYears.map(String),
    mean: list('mean'), sd: list('sd'), shift: list('shift'), mu: list('mu'), sigma: list('sigma'),
    method: release.method, citation: release.citation, doi: release.doi ?? '', licence: release.licence,
  })
  if (d.levels) {
    draft.levels = (d.levels as number[]).map(show)
    draft.values = (d.values as number[][]).map(row => row.map(show))
  }
  else {
    draft.values = d.anchorYears.map(() => draft.levels.map(() => ''))
  }
  // Draws are not editable cell by cell; the stored ones travel as the CSV they came from.
  if (release.form === 'samples') Object.assign(draft, { csv: releaseCsv(d), csvName })
  return draft
}

/** Text as a number; a comma is taken as a decimal point. Blank or unreadable gives NaN (sent as null). */
export function numberFrom(text: string): number {
  const trimmed = text.trim().replace(/^(-?\d*),(\d+)$/, '$1.$2')
  return trimmed === '' ? Number.NaN : Number(trimmed)
}

/** The distribution part of the request (the preview route takes exactly this). */
export function draftContent(draft: DraftModel) {
  const base = { form: draft.form, unit: draft.unit, baselineYear: numberFrom(draft.baselineYear) }
  const usesCsv = (draft.form === 'quantiles' || draft.form === 'samples') && draft.csv !== null
  if (usesCsv) return { ...base, csv: draft.csv! }
  const numbers = (texts: string[]) => texts.map(numberFrom)
  const anchorYears = numbers(draft.anchorYears)
  switch (draft.form) {
    case 'normal':
      return { ...base, anchorYears, mean: numbers(draft.mean), sd: numbers(draft.sd) }
    case 'lognormal':
      return { ...base, anchorYears, shift: numbers(draft.shift), mu: numbers(draft.mu), sigma: numbers(draft.sigma) }
    case 'quantiles':
      return { ...base, anchorYears, levels: numbers(draft.levels), values: draft.values.map(numbers) }
    default:
      return { ...base, csv: '' }
  }
}

export function draftProvenance(draft: DraftModel) {
  return { method: draft.method, citation: draft.citation, doi: draft.doi, licence: draft.licence }
}

/** Anchor years and levels are added and removed across every per-anchor list at once. */
export function addAnchor(draft: DraftModel) {
  const last = numberFrom(draft.anchorYears[draft.anchorYears.length - 1] ?? '')
  draft.anchorYears.push(Number.isFinite(last) ? String(last + 50) : '')
  for (const key of PER_ANCHOR) draft[key].push('')
  draft.values.push(draft.levels.map(() => ''))
}

export function removeAnchor(draft: DraftModel, index: number) {
  draft.anchorYears.splice(index, 1)
  for (const key of PER_ANCHOR) draft[key].splice(index, 1)
  draft.values.splice(index, 1)
}

export function addLevel(draft: DraftModel) {
  draft.levels.push('')
  for (const row of draft.values) row.push('')
}

export function removeLevel(draft: DraftModel, index: number) {
  draft.levels.splice(index, 1)
  for (const row of draft.values) row.splice(index, 1)
}

/** The API's field issues from a refused request ({ data: { issues } } in the error body). */
export function issuesOf(error: unknown): FieldIssue[] {
  const issues = (error as { data?: { data?: { issues?: FieldIssue[] } } })?.data?.data?.issues
  return Array.isArray(issues) ? issues : []
}

/** Messages for a field: its own name, or anything below it ("mean.1", "values[0]", "csv row 3"). */
export function messagesFor(issues: FieldIssue[], ...fields: string[]): string[] {
  return issues
    .filter(issue => fields.some(field => issue.field === field || new RegExp(`^${field}[.[ ]`).test(issue.field)))
    .map(issue =>
      issue.label === undefined
        ? `${issue.field}: ${issue.message}`
        : [issue.label, issue.message].filter(Boolean).join(': '),
    )
}

/** Are cells still blank? The preview waits for them rather than listing every empty cell. */
export function draftHasBlanks(draft: DraftModel): boolean {
  const blank = (texts: string[]) => texts.some(text => text.trim() === '')
  if (draft.baselineYear.trim() === '') return true
  if (draft.form === 'samples') return draft.csv === null
  if (draft.form === 'quantiles' && draft.csv !== null) return false
  const fields
    = draft.form === 'normal'
      ? [draft.mean, draft.sd]
      : draft.form === 'lognormal'
        ? [draft.shift, draft.mu, draft.sigma]
        : [draft.levels, ...draft.values]
  return blank(draft.anchorYears) || fields.some(blank)
}
