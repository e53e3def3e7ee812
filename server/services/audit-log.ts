import { desc, eq } from 'drizzle-orm'
import { auditLog, users } from '~~/server/db/schema'

/** The latest audit lines, newest first: one organisation's, or the whole instance's (null). */
export async function listAudit(organisationId: string | null, limit: number) {
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
    .where(organisationId ? eq(auditLog.organisationId, organisationId) : undefined)
    .orderBy(desc(auditLog.id))
    .limit(limit)
}
