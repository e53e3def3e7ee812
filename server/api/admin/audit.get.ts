import { LimitQuery } from '#shared/schemas/params'
import { listAudit } from '~~/server/services/audit-log'

const Query = LimitQuery(500, 100)

// The latest privileged actions, newest first: an admin's organisation's, or the whole instance's for the operator.
export default defineEventHandler(async (event) => {
  const scope = administeredOrganisation(await requireAdmin(event))
  const { limit } = readValidQuery(event, Query)
  return listAudit(scope, limit)
})
