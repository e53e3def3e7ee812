import { languageOf, translator } from '#shared/wording/translate'
import { uploadIssueMessage } from '#shared/wording/uploads'
import { issuePath, issueRule, valueAt, type IssueRule } from '~/utils/issueRules'
import type { FieldIssue } from '~/utils/releaseDraft'

/** The visible label of the field an issue names (its code and its path into the body), or '' for none. */
export type FieldLabel = (field: string, path: string[]) => string

/**
 * The API's issue in the reader's words: the field's label, and the message in their language (an
 * uploaded file's issue from its facts, a common rule from the field's value, else the API's text).
 */
export function useIssueWording(label: FieldLabel) {
  const { t, n, locale } = useI18n()
  const units: Record<string, () => string> = {
    'degrees': () => '°',
    'm': () => ' m',
    'mm/yr': () => ` ${t('issues.units.mmPerYear')}`,
    'year': () => ` ${t('issues.units.years')}`,
    'years': () => ` ${t('issues.units.years')}`,
  }
  const limit = (rule: IssueRule) =>
    'unit' in rule
      ? `${n(rule.limit)}${units[rule.unit]?.() ?? (rule.unit ? ` ${rule.unit}` : '')}`
      : 'limit' in rule
        ? n(rule.limit)
        : ''
  // Years are written without a thousands separator.
  const shown = (rule: IssueRule) =>
    'unit' in rule && !rule.unit && Number.isInteger(rule.limit) && rule.limit >= 1000
      ? String(rule.limit)
      : limit(rule)

  return (issue: FieldIssue, body: unknown): FieldIssue => {
    const path = issuePath(issue.field)
    const rule = issue.code ? undefined : issueRule(issue.message, valueAt(body, path))
    const message = issue.code
      ? uploadIssueMessage(translator(languageOf(locale.value)), { code: issue.code, params: issue.params })
      : rule
        ? t(`issues.${rule.rule}`, { limit: shown(rule) })
        : issue.message.charAt(0).toUpperCase() + issue.message.slice(1)
    return { field: issue.field, label: label(issue.field, path), message }
  }
}

/**
 * A form's field issues (from useSubmit) as the reader should see them: worded by useIssueWording, and
 * gone once the field they name has changed since the refused request, so a fixed field no longer says
 * it is wrong. `body` builds the request from the form as it is now, exactly as the form sends it.
 * `summary` is for the form's alert: what is left to fix, or the API's message when it named no field.
 */
export function useFieldIssues(
  submit: { error: Ref<string>, issues: Ref<FieldIssue[]> },
  body: () => unknown,
  label: FieldLabel,
) {
  const { t } = useI18n()
  const { error, issues } = submit
  const word = useIssueWording(label)
  const snapshot = (now: unknown, field: string) => JSON.stringify(valueAt(now, issuePath(field)) ?? null)
  const sent = shallowRef(new Map<FieldIssue, string>())
  watch(issues, (list) => {
    const now = body()
    sent.value = new Map(list.map(issue => [issue, snapshot(now, issue.field)]))
  })
  const shown = computed(() => {
    const now = body()
    return issues.value
      .filter(issue => sent.value.get(issue) === snapshot(now, issue.field))
      .map(issue => word(issue, now))
  })
  const summary = computed(() => {
    if (!issues.value.length) return error.value
    const left = shown.value.length
    return left ? t('issues.summary', { n: left }, left) : ''
  })
  return { shown, summary }
}
