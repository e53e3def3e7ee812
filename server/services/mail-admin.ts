import { desc, eq, inArray } from 'drizzle-orm'
import { simpleParser } from 'mailparser'
import { mailbox, mailOutbox, users } from '~~/server/db/schema'

// What administrators read about the instance's mail: the outbox (every message's delivery) and the
// demo mailbox (what the local stand-in SMTP server received).

const SHOWN_HEADERS = ['date', 'message-id', 'list-unsubscribe', 'list-unsubscribe-post', 'content-type']

/** The newest messages of the outbox; `organisationId` keeps those to that organisation's people (null: all). */
export async function listOutbox(organisationId: string | null, limit: number) {
  const db = await useDb()
  return db
    .select({
      id: mailOutbox.id,
      to: mailOutbox.to,
      subject: mailOutbox.subject,
      state: mailOutbox.state,
      attempts: mailOutbox.attempts,
      lastError: mailOutbox.lastError,
      nextAttemptAt: mailOutbox.nextAttemptAt,
      createdAt: mailOutbox.createdAt,
      sentAt: mailOutbox.sentAt,
    })
    .from(mailOutbox)
    .where(
      organisationId
        ? inArray(
            mailOutbox.to,
            db.select({ email: users.email }).from(users).where(eq(users.organisationId, organisationId)),
          )
        : undefined,
    )
    .orderBy(desc(mailOutbox.createdAt))
    .limit(limit)
}

/** What the stand-in SMTP server received, newest first, parsed for reading. */
export async function readMailbox(limit: number) {
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
}
