import { desc } from 'drizzle-orm'
import { simpleParser } from 'mailparser'
import { z } from 'zod'
import { mailbox } from '~~/server/db/schema'

const SHOWN_HEADERS = ['date', 'message-id', 'list-unsubscribe', 'list-unsubscribe-post', 'content-type']
const LIMIT = 'Use a whole number from 1 to 200.'
const Query = z.object({ limit: z.coerce.number({ error: LIMIT }).int({ error: LIMIT }).min(1, { error: LIMIT }).max(200, { error: LIMIT }).default(50) })

// What the local stand-in SMTP server received, newest first, parsed for reading. It holds every
// reset and invitation link the instance sent, so only the operator reads it, and only on the demo:
// with a real mail server (SMTP_URL) mail belongs in people's own inboxes.
export default defineEventHandler(async (event) => {
  await requireOperator(event)
  if (serverConfig().SMTP_URL) throw createError({ statusCode: 404, message: 'No such mailbox: mail goes to the mail server set in SMTP_URL.' })
  const { limit } = readValidQuery(event, Query)
  const db = await useDb()
  const rows = await db.select().from(mailbox).orderBy(desc(mailbox.receivedAt)).limit(limit)
  return Promise.all(rows.map(async (row) => {
    const parsed = await simpleParser(row.raw)
    return {
      id: row.id, receivedAt: row.receivedAt, to: row.envelopeTo, from: row.envelopeFrom, subject: parsed.subject ?? '',
      text: parsed.text ?? '', html: typeof parsed.html === 'string' ? parsed.html : '',
      // From the raw header lines: mailparser folds List-* headers into one parsed 'list' entry.
      headers: Object.fromEntries(parsed.headerLines.filter(({ key }) => SHOWN_HEADERS.includes(key))
        .map(({ key, line }) => [key, line.slice(line.indexOf(':') + 1).replace(/\r?\n\s+/g, ' ').trim()])),
    }
  }))
})
