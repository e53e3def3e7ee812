import { desc } from 'drizzle-orm'
import { z } from 'zod'
import { mailOutbox } from '~~/server/db/schema'

const LIMIT = 'Use a whole number from 1 to 500.'
const Query = z.object({ limit: z.coerce.number({ error: LIMIT }).int({ error: LIMIT }).min(1, { error: LIMIT }).max(500, { error: LIMIT }).default(100) })

// The outbox with each message's state, attempts and last error, so failures are visible.
export default defineEventHandler(async (event) => {
  await requireAdmin(event)
  const { limit } = readValidQuery(event, Query)
  const db = await useDb()
  const rows = await db.select({
    id: mailOutbox.id, to: mailOutbox.to, subject: mailOutbox.subject, state: mailOutbox.state, attempts: mailOutbox.attempts,
    lastError: mailOutbox.lastError, nextAttemptAt: mailOutbox.nextAttemptAt, createdAt: mailOutbox.createdAt, sentAt: mailOutbox.sentAt,
  }).from(mailOutbox).orderBy(desc(mailOutbox.createdAt)).limit(limit)
  const { describe } = await mailTransport()
  return { transport: describe, messages: rows }
})
