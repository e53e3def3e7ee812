import type { BandsAtYear } from '#shared/releases/summary'
import type { ApiResponse } from '~/utils/apiResponse'

/** One row of GET /api/releases. */
export type ReleaseRow = ApiResponse<'/api/releases'>[number]

/** The year a library table summarises a release at: 2100 when it is an anchor, else the last anchor. */
export const SUMMARY_YEAR = 2100

/**
 * Words and numbers for published science, in the reader's language and height units. Heights
 * arrive in metres; the preferences store turns them into what the reader asked for.
 */
export function useScienceText() {
  const { t } = useI18n()
  const dateTime = useDateTime()
  const preferences = usePreferencesStore()
  const height = (metres: number) => preferences.height(metres)
  return {
    height,
    component: (key: string) => t(`components.${key}`),
    state: (state: string) => t(`states.${state}`),
    form: (form: string) => t(`editor.forms.${form}`),
    range: (low: number, high: number) => t('release.rangeValue', { low: height(low), high: height(high) }),
    /** A change with its sign always shown, so "no change" and "lower" read differently. */
    change: (metres: number) => {
      // The sign follows the shown digits: a change that rounds to zero reads as zero.
      const shown = height(Math.abs(metres))
      if (shown === height(0)) return shown
      return metres > 0 ? `+${shown}` : `−${shown}`
    },
    date: (value: string | null | undefined) => dateTime(value, 'day') || '—',
    /** The bands at the summary year, or at the last anchor when 2100 is not one. */
    headline: (summary: BandsAtYear[]) => summary.find(b => b.year === SUMMARY_YEAR) ?? summary[summary.length - 1],
  }
}
