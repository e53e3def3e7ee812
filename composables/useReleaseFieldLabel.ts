import type { FieldLabel } from '~/composables/useFieldIssues'
import type { DraftModel } from '~/utils/releaseDraft'

// The release editor's visible labels by the API's field codes (the body of POST /api/releases and of
// the preview), so an issue names the field, cell or CSV row as the analyst sees it.
const LABELS: Record<string, string> = {
  'series.component': 'library.component',
  'series.scenario': 'library.scenario',
  'series.title': 'editor.title',
  'form': 'editor.formLegend',
  'unit': 'editor.unitLegend',
  'baselineYear': 'editor.baselineYear',
  'anchorYears': 'editor.anchorYear',
  'levels': 'editor.level',
  'method': 'release.method',
  'citation': 'release.citation',
  'doi': 'editor.doi',
  'licence': 'release.licence',
}
const PARAMETERS = new Set(['mean', 'sd', 'shift', 'mu', 'sigma'])

export function useReleaseFieldLabel(draft: () => DraftModel): FieldLabel {
  const { t } = useI18n()
  const year = (index: string) => draft().anchorYears[Number(index)] ?? ''
  return (field, path) => {
    const [head, first, second] = path
    if (head === 'csv') {
      const file = t(draft().form === 'samples' ? 'editor.csvDrawsLabel' : 'editor.csvQuantilesLabel')
      const row = field.match(/^csv row (\d+)(?:, column (.+))?$/)
      return row ? t(row[2] ? 'issues.csvCell' : 'issues.csvRow', { file, row: row[1], column: row[2] }) : file
    }
    if (first !== undefined) {
      if (head === 'anchorYears') return t('editor.anchorYearN', { n: Number(first) + 1 })
      if (head === 'levels') return t('editor.levelN', { n: Number(first) + 1 })
      if (head && PARAMETERS.has(head)) return t('editor.paramAt', { param: t(`editor.${head}`), year: year(first) })
      if (head === 'values' && second !== undefined)
        return t('editor.valueAt', { level: draft().levels[Number(second)] ?? '', year: year(first) })
      if (head === 'values') return t('editor.valuesAt', { year: year(first) })
    }
    if (head && PARAMETERS.has(head)) return t(`editor.${head}`)
    const key = LABELS[path.join('.')]
    return key ? t(key) : ''
  }
}
