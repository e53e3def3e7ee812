import { LimitQuery } from '#shared/schemas/params'
import { listOutbox } from '~~/server/services/mail-admin'

const Query = LimitQuery(500, 100)

// The outbox with each message's state, attempts and last error, so failures are visible. An admin
// sees the messages to their organisation's people; the operator sees all of them.
export default defineEventHandler(async (event) => {
  const scope = administeredOrganisation(await requireAdmin(event))
  const { limit } = readValidQuery(event, Query)
  const messages = await listOutbox(scope, limit)
  const { describe } = await mailTransport()
  return { transport: describe, messages }
})
