import { desc, eq } from 'drizzle-orm'
import { z } from 'zod'
import { auditLog, users } from '~~/server/db/schema'

const Query = z.object({ limit: z.coerce.number().int().min(1).max(500).default(100) })

// The latest privileged actions, newest first.
export default defineEventHandler(async (event) => {
  await requireAdmin(event)
  const { limit } = await getValidatedQuery(event, query => Query.parse(query))
  const db = await useDb()
  return db.select({
    id: auditLog.id,
    at: auditLog.at,
    action: auditLog.action,
    targetType: auditLog.targetType,
    targetId: auditLog.targetId,
    detail: auditLog.detail,
    actorName: users.name,
  }).from(auditLog)
    .leftJoin(users, eq(users.id, auditLog.actorId))
    .orderBy(desc(auditLog.id))
    .limit(limit)
})
