import { desc } from 'drizzle-orm'
import { simpleParser } from 'mailparser'
import { z } from 'zod'
import { mailbox } from '~~/server/db/schema'

const Query = z.object({ limit: z.coerce.number().int().min(1).max(200).default(50) })

// What the local stand-in SMTP server received, newest first, parsed for reading.
export default defineEventHandler(async (event) => {
  await requireAdmin(event)
  const { limit } = readValidQuery(event, Query)
  const db = await useDb()
  const rows = await db.select().from(mailbox).orderBy(desc(mailbox.receivedAt)).limit(limit)
  return Promise.all(rows.map(async (row) => {
    const parsed = await simpleParser(row.raw)
    return {
      id: row.id, receivedAt: row.receivedAt, to: row.envelopeTo, from: row.envelopeFrom, subject: parsed.subject ?? '',
      text: parsed.text ?? '', html: typeof parsed.html === 'string' ? parsed.html : '',
      headers: Object.fromEntries([...parsed.headers].filter(([key]) => ['date', 'message-id', 'list-unsubscribe', 'list-unsubscribe-post', 'content-type'].includes(key)).map(([key, value]) => [key, typeof value === 'string' ? value : JSON.stringify(value)])),
    }
  }))
})
