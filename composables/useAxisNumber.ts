import { axisNumberFormat } from '~/utils/chartStyle'

/** The axis formatter for the page's language; years are labelled with their own formatter. */
export function useAxisNumber() {
  const { locale } = useI18n()
  return (value: number) => axisNumberFormat(locale.value)(value)
}
