import { auditLog } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import type { CurrentUser } from './auth'

type Executor = Pick<Database, 'insert'>

/** Every privileged action leaves a line; pass the transaction so the line commits with the change. */
export async function writeAudit(
  executor: Executor,
  actor: CurrentUser | null,
  action: string,
  target: { type: string, id?: string | null },
  detail: Record<string, unknown> = {},
) {
  await executor.insert(auditLog).values({
    actorId: actor?.id ?? null,
    organisationId: actor?.organisationId ?? null,
    action,
    targetType: target.type,
    targetId: target.id ?? null,
    detail,
  })
}
