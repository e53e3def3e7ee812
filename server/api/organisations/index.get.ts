import { asc } from 'drizzle-orm'
import { organisations } from '~~/server/db/schema'

// Organisations are chosen when an admin creates a user.
export default defineEventHandler(async (event) => {
  await requireAdmin(event)
  const db = await useDb()
  return db.select().from(organisations).orderBy(asc(organisations.name))
})
