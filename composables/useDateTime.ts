const STYLES: Record<'short' | 'seconds' | 'date', Intl.DateTimeFormatOptions> = {
  short: { dateStyle: 'medium', timeStyle: 'short' },
  // For work that finishes within the minute (a recomputation), where minutes alone would hide it.
  seconds: { dateStyle: 'medium', timeStyle: 'medium' },
  date: { dateStyle: 'long' },
}

/** Dates and times in the reader's language; '' for a moment that has not happened (yet). */
export function useDateTime() {
  const { locale } = useI18n()
  return (value: string | Date | null | undefined, style: keyof typeof STYLES = 'short') =>
    value ? new Date(value).toLocaleString(locale.value, STYLES[style]) : ''
}
