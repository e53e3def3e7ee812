import { PASSWORD_MIN_LENGTH } from '#shared/schemas/users'

/** Says what to fix before a new password is sent ('' when it may go); the server checks again. */
export function usePasswordCheck() {
  const { t } = useI18n()
  return (password: string, again: string) => {
    if (password.length < PASSWORD_MIN_LENGTH) return t('account.tooShort', { min: PASSWORD_MIN_LENGTH })
    if (password !== again) return t('account.mismatch')
    return ''
  }
}
