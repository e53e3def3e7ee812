import { auditLog } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import type { CurrentUser } from './auth'

type Executor = Pick<Database, 'insert'>

/**
 * Every privileged action leaves a line; pass the transaction so the line commits with the change.
 * Lines without an actor (a failed sign-in, an accepted invitation) name the organisation concerned
 * when it is known, so its administrators can find them.
 */
export async function writeAudit(
  executor: Executor,
  actor: CurrentUser | null,
  action: string,
  target: { type: string, id?: string | null },
  detail: Record<string, unknown> = {},
  organisationId: string | null = actor?.organisationId ?? null,
) {
  await executor.insert(auditLog).values({
    actorId: actor?.id ?? null,
    organisationId,
    action,
    targetType: target.type,
    targetId: target.id ?? null,
    detail,
  })
}
