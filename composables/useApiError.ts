import { FetchError } from 'ofetch'

/** The message the API gave (it always says what to fix), or a plain network message. */
export function useApiError() {
  const { t } = useI18n()
  return (error: unknown): string => {
    if (error instanceof FetchError) {
      const message = error.data?.message
      if (typeof message === 'string' && message) return message
      if (!error.response) return t('errors.network')
    }
    return t('errors.title')
  }
}
