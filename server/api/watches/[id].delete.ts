import { and, eq } from 'drizzle-orm'
import { watches } from '~~/server/db/schema'
import { IdParams } from '#shared/schemas/users'

// Stop one of your own watches.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const db = await useDb()
  const [stopped] = await db.update(watches).set({ state: 'unsubscribed', unsubscribedAt: new Date(), confirmTokenHash: null })
    .where(and(eq(watches.id, id), eq(watches.email, user.email))).returning({ id: watches.id })
  if (!stopped) throw createError({ statusCode: 404, message: 'No such watch.' })
  return { stopped: true }
})
