import { asc, eq } from 'drizzle-orm'
import { organisations } from '~~/server/db/schema'

// Organisations are chosen when someone is created or invited: an admin can choose only their own.
export default defineEventHandler(async (event) => {
  const admin = await requireAdmin(event)
  const scope = administeredOrganisation(admin)
  const db = await useDb()
  return db.select().from(organisations).where(scope ? eq(organisations.id, scope) : undefined).orderBy(asc(organisations.name))
})
