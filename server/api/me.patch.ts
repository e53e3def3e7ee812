import { PreferencesSchema } from '#shared/schemas/users'
import { setOwnLocale } from '~~/server/services/users'

// A user's own preferences (language), remembered across devices.
export default defineEventHandler(async (event) => {
  const current = await requireUser(event)
  const { locale } = await readValidBody(event, PreferencesSchema)
  await setOwnLocale(current, locale)
  const user = { ...current, locale }
  await refreshSessionSnapshot(event, user)
  return { user }
})
