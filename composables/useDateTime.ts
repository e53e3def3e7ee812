import { dateLocale } from '#shared/wording/dates'

const STYLES: Record<'short' | 'seconds' | 'date' | 'day', Intl.DateTimeFormatOptions> = {
  short: { dateStyle: 'medium', timeStyle: 'short' },
  // For work that finishes within the minute (a recomputation), where minutes alone would hide it.
  seconds: { dateStyle: 'medium', timeStyle: 'medium' },
  date: { dateStyle: 'long' },
  day: { dateStyle: 'medium' },
}

/** Dates and times in the reader's language (day first in English too); '' for a moment that has not happened (yet). */
export function useDateTime() {
  const { locale } = useI18n()
  return (value: string | Date | null | undefined, style: keyof typeof STYLES = 'short') =>
    value ? new Date(value).toLocaleString(dateLocale(locale.value), STYLES[style]) : ''
}
