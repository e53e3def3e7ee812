import { eq } from 'drizzle-orm'
import { users } from '~~/server/db/schema'
import { PreferencesSchema } from '#shared/schemas/users'

// A user's own preferences (language), remembered across devices.
export default defineEventHandler(async (event) => {
  const current = await requireUser(event)
  const { locale } = await readValidBody(event, PreferencesSchema)
  const db = await useDb()
  await db.update(users).set({ locale, updatedAt: new Date() }).where(eq(users.id, current.id))
  const user = { ...current, locale }
  await refreshSessionSnapshot(event, user)
  return { user }
})
