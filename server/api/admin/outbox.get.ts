import { desc, eq, inArray } from 'drizzle-orm'
import { z } from 'zod'
import { mailOutbox, users } from '~~/server/db/schema'

const LIMIT = 'Use a whole number from 1 to 500.'
const Query = z.object({ limit: z.coerce.number({ error: LIMIT }).int({ error: LIMIT }).min(1, { error: LIMIT }).max(500, { error: LIMIT }).default(100) })

// The outbox with each message's state, attempts and last error, so failures are visible. An admin
// sees the messages to their organisation's people; the operator sees all of them.
export default defineEventHandler(async (event) => {
  const scope = administeredOrganisation(await requireAdmin(event))
  const { limit } = readValidQuery(event, Query)
  const db = await useDb()
  const rows = await db.select({
    id: mailOutbox.id, to: mailOutbox.to, subject: mailOutbox.subject, state: mailOutbox.state, attempts: mailOutbox.attempts,
    lastError: mailOutbox.lastError, nextAttemptAt: mailOutbox.nextAttemptAt, createdAt: mailOutbox.createdAt, sentAt: mailOutbox.sentAt,
  }).from(mailOutbox)
    .where(scope ? inArray(mailOutbox.to, db.select({ email: users.email }).from(users).where(eq(users.organisationId, scope))) : undefined)
    .orderBy(desc(mailOutbox.createdAt)).limit(limit)
  const { describe } = await mailTransport()
  return { transport: describe, messages: rows }
})
