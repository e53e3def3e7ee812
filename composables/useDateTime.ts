/** Dates and times in the reader's language; '' for a moment that has not happened (yet). */
export function useDateTime() {
  const { locale } = useI18n()
  return (value: string | Date | null | undefined, style: 'short' | 'date' = 'short') => {
    if (!value) return ''
    const options: Intl.DateTimeFormatOptions = style === 'date' ? { dateStyle: 'long' } : { dateStyle: 'medium', timeStyle: 'short' }
    return new Date(value).toLocaleString(locale.value, options)
  }
}
