import type { FieldLabel } from '~/composables/useFieldIssues'

/**
 * A form's visible labels by the API's field codes, for useFieldIssues: `keys` maps a field (or its
 * first part, for "years.2" or "matrix.0.1") to an i18n key; `special` words a field that needs more
 * (a matrix cell, a CSV row) and returns undefined otherwise.
 */
export function useFieldLabels(
  keys: Record<string, string>,
  special?: (field: string, path: string[]) => string | undefined,
): FieldLabel {
  const { t } = useI18n()
  return (field, path) => {
    const worded = special?.(field, path)
    if (worded !== undefined) return worded
    const key = keys[path.join('.')] ?? keys[path[0] ?? '']
    return key ? t(key) : ''
  }
}

/** "Grid file (CSV), row 3, column 2" for an issue the API places in an uploaded CSV. */
export function useCsvRowLabel(file: () => string) {
  const { t } = useI18n()
  return (field: string) => {
    const row = field.match(/^csv row (\d+)(?:, column (.+))?$/)
    return row
      ? t(row[2] ? 'issues.csvCell' : 'issues.csvRow', { file: file(), row: row[1], column: row[2] })
      : undefined
  }
}

/** Provenance fields shared by releases, correlation sets and scale-factor grids. */
export const PROVENANCE_LABELS: Record<string, string> = {
  method: 'release.method',
  citation: 'release.citation',
  doi: 'editor.doi',
  licence: 'release.licence',
}
