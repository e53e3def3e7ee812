/**
 * Used and expired links are the usual failures of e-mailed links; they are said in the reader's
 * language (the API speaks English), anything else as the API put it. Works for $fetch failures
 * and for useFetch errors alike (both carry statusCode).
 */
export function useLinkError() {
  const { t } = useI18n()
  const describeError = useApiError()
  return (failure: unknown): { message: string, gone: boolean } => {
    const status = (failure as { statusCode?: number } | null)?.statusCode
    if (status === 404) return { message: t('account.linkUsed'), gone: true }
    if (status === 410) return { message: t('account.linkExpired'), gone: true }
    return { message: describeError(failure), gone: false }
  }
}
