import { asc, eq } from 'drizzle-orm'
import { organisations, users } from '~~/server/db/schema'

export default defineEventHandler(async (event) => {
  await requireAdmin(event)
  const db = await useDb()
  return db.select({
    id: users.id,
    email: users.email,
    name: users.name,
    role: users.role,
    disabled: users.disabled,
    organisationId: users.organisationId,
    organisationName: organisations.name,
    createdAt: users.createdAt,
  }).from(users)
    .innerJoin(organisations, eq(organisations.id, users.organisationId))
    .orderBy(asc(organisations.name), asc(users.name))
})
