import type { FieldLabel } from '~/composables/useFieldIssues'

// The site form's visible labels by the API's field codes (the body of POST /api/sites, plus the
// annual maxima upload's csv), so an issue names the field as the planner sees it.
const LABELS: Record<string, string> = {
  'name': 'sites.form.name',
  'latitude': 'sites.form.latitude',
  'longitude': 'sites.form.longitude',
  'referenceLevel': 'sites.form.referenceLevel',
  'referenceEpoch': 'sites.datum.epoch',
  'datum.kind': 'sites.datum.kind',
  'datum.offset': 'sites.datum.offset',
  'landMotion.rateMmPerYear': 'sites.form.rate',
  'landMotion.sigmaMmPerYear': 'sites.form.sigma',
  'landMotion.source': 'sites.form.source',
  'landMotion.reference': 'sites.form.reference',
  'landMotion.epoch': 'sites.form.epoch',
  'thresholds': 'sites.form.thresholdsTitle',
  'gumbel.location': 'sites.extremes.location',
  'gumbel.scale': 'sites.extremes.scale',
  'csv': 'sites.extremes.paste',
  'planning.scenario': 'sites.planning.scenario',
  'planning.tolerance': 'sites.planning.tolerance',
}
const THRESHOLD_LABELS: Record<string, string> = {
  label: 'sites.form.thresholdLabel',
  height: 'sites.form.thresholdHeight',
  kind: 'sites.form.thresholdKind',
  buildYear: 'sites.form.buildYear',
  designLifeYears: 'sites.form.designLife',
}

const upperFirst = (text: string) => text.charAt(0).toUpperCase() + text.slice(1)

export function useSiteFieldLabel(thresholdNames: () => string[]): FieldLabel {
  const { t } = useI18n()
  const preferences = usePreferencesStore()
  const say = (key: string) => t(key, { unit: preferences.units })
  return (field, path) => {
    const row = field.match(/^csv row (\d+)(?:, column (.+))?$/)
    if (row)
      return t(row[2] ? 'issues.csvCell' : 'issues.csvRow', { file: say(LABELS.csv!), row: row[1], column: row[2] })
    const [head, index, part] = path
    if (head === 'thresholds' && index !== undefined) {
      const typed = thresholdNames()[Number(index)]
      const name = typed || upperFirst(t('sites.form.thresholdNumber', { n: Number(index) + 1 }))
      return part && THRESHOLD_LABELS[part]
        ? t('issues.within', { item: name, label: say(THRESHOLD_LABELS[part]) })
        : name
    }
    const key = LABELS[path.join('.')]
    return key ? say(key) : ''
  }
}
