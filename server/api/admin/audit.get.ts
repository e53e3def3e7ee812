import { desc, eq } from 'drizzle-orm'
import { z } from 'zod'
import { auditLog, users } from '~~/server/db/schema'

const LIMIT = 'Use a whole number from 1 to 500.'
const Query = z.object({ limit: z.coerce.number({ error: LIMIT }).int({ error: LIMIT }).min(1, { error: LIMIT }).max(500, { error: LIMIT }).default(100) })

// The latest privileged actions, newest first: an admin's organisation's, or the whole instance's for the operator.
export default defineEventHandler(async (event) => {
  const scope = administeredOrganisation(await requireAdmin(event))
  const { limit } = readValidQuery(event, Query)
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
    .where(scope ? eq(auditLog.organisationId, scope) : undefined)
    .orderBy(desc(auditLog.id))
    .limit(limit)
})
