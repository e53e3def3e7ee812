import { and, eq, inArray, isNull, lt, lte, or, sql } from 'drizzle-orm'
import nodemailer, { type Transporter } from 'nodemailer'
import { mailOutbox, watches } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import { startStandInSmtp } from '../mail/standin'

// All mail goes through the outbox: queued with the change that caused it, sent by a loop that
// claims due messages under a lease (so two senders never send one message twice), marked sent
// only once the server has accepted it, and retried with backoff while the server is away.

export interface OutgoingMail {
  to: string
  subject: string
  text: string
  html: string
  headers?: Record<string, string>
  dedupeKey?: string
}

export const MAX_MAIL_ATTEMPTS = 12
const BATCH = 20
const LEASE_MS = 60_000

const retryBaseMs = () => serverConfig().MAIL_RETRY_BASE_MS
export const mailFrom = () => serverConfig().MAIL_FROM
/** Where links in e-mails point. */
export const appUrl = () => serverConfig().APP_URL

/** Queue a message; pass the transaction of the change that causes it. A repeated dedupeKey is ignored. */
export async function queueMail(executor: Pick<Database, 'insert'>, mail: OutgoingMail) {
  await executor.insert(mailOutbox).values({ ...mail, headers: mail.headers ?? {} }).onConflictDoNothing()
  setImmediate(kickMail)
}

let transport: Promise<{ transporter: Transporter, describe: string }> | undefined

export function mailTransport() {
  transport ??= (async () => {
    const { SMTP_URL, SMTP_STANDIN_PORT } = serverConfig()
    if (SMTP_URL) return { transporter: nodemailer.createTransport(SMTP_URL), describe: 'SMTP server (SMTP_URL)' }
    const standIn = await startStandInSmtp(await useDb(), SMTP_STANDIN_PORT)
    console.info(
      `[brinkwater] No SMTP_URL: mail goes to the local stand-in on 127.0.0.1:${standIn.port} (read it on the admin mailbox page).`,
    )
    return {
      transporter: nodemailer.createTransport({
        host: '127.0.0.1',
        port: standIn.port,
        secure: false,
        ignoreTLS: true,
      }),
      describe: `local stand-in on port ${standIn.port}`,
    }
  })()
  return transport
}

let running: Promise<void> | null = null
let again = false

/** Sends what is due now; calls made while a pass runs fold into one more pass. */
export function kickMail() {
  if (running) {
    again = true
    return running
  }
  running = deliverDueMail().catch(error => console.error('[brinkwater] mail pass failed:', error)).finally(() => {
    running = null
    if (again) {
      again = false
      kickMail()
    }
  })
  return running
}

async function claimDue(db: Database) {
  const now = new Date()
  return db.transaction(async (tx) => {
    const due = await tx
      .select({ id: mailOutbox.id })
      .from(mailOutbox)
      .where(
        and(
          eq(mailOutbox.state, 'queued'),
          lte(mailOutbox.nextAttemptAt, now),
          or(isNull(mailOutbox.lockedUntil), lt(mailOutbox.lockedUntil, now)),
        ),
      )
      .orderBy(mailOutbox.createdAt)
      .limit(BATCH)
      .for('update', { skipLocked: true })
    if (!due.length) return []
    return tx.update(mailOutbox).set({ lockedUntil: new Date(now.getTime() + LEASE_MS) })
      .where(inArray(mailOutbox.id, due.map(row => row.id))).returning()
  })
}

export async function deliverDueMail() {
  const db = await useDb()
  const { transporter } = await mailTransport()
  for (let batch = await claimDue(db); batch.length; batch = await claimDue(db)) {
    for (const message of batch) {
      try {
        const info = await transporter.sendMail({
          from: mailFrom(),
          to: message.to,
          subject: message.subject,
          text: message.text,
          html: message.html,
          headers: message.headers,
        })
        await db
          .update(mailOutbox)
          .set({
            state: 'sent',
            sentAt: new Date(),
            messageId: info.messageId,
            lockedUntil: null,
            attempts: sql`${mailOutbox.attempts} + 1`,
          })
          .where(eq(mailOutbox.id, message.id))
      }
      catch (error) {
        if (isPermanentRefusal(error)) {
          await refusedForGood(db, message, error)
          continue
        }
        const attempts = message.attempts + 1
        const delay = Math.min(retryBaseMs() * 2 ** (attempts - 1), 60 * 60_000)
        await db.update(mailOutbox).set({
          attempts, lastError: error instanceof Error ? error.message : String(error), lockedUntil: null,
          state: attempts >= MAX_MAIL_ATTEMPTS ? 'failed' : 'queued', nextAttemptAt: new Date(Date.now() + delay),
        }).where(eq(mailOutbox.id, message.id))
      }
    }
  }
}

/**
 * A 5xx answer (a mailbox that does not exist, an address the server will not take) will not change
 * by trying again: the message fails at once instead of being retried for hours, and keeping
 * health "degraded" all that while.
 */
function isPermanentRefusal(error: unknown) {
  const code = (error as { responseCode?: unknown } | null)?.responseCode
  return typeof code === 'number' && code >= 500 && code < 600
}

async function refusedForGood(db: Database, message: typeof mailOutbox.$inferSelect, error: unknown) {
  await db.transaction(async (tx) => {
    await tx
      .update(mailOutbox)
      .set({
        state: 'failed',
        attempts: message.attempts + 1,
        lockedUntil: null,
        lastError: `The mail server refused this address for good: ${error instanceof Error ? error.message : String(error)}`,
      })
      .where(eq(mailOutbox.id, message.id))
    // Watches of that address send nothing more until it asks again (server/services/notify.ts).
    await tx
      .update(watches)
      .set({ undeliverableAt: new Date() })
      .where(and(eq(watches.email, message.to), isNull(watches.undeliverableAt)))
  })
}
