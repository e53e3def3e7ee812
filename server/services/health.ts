import { and, eq, gt, sql } from 'drizzle-orm'
import type { DatabaseHandle, DatabaseKind } from '~~/server/db/client'
import { jobs, mailOutbox, outlooks } from '~~/server/db/schema'
import { scrubError } from './health-scrub'

// What GET /api/health reports. The route is public, so nothing here names a host, an address,
// a user or a secret: only kinds, counts, ages and a scrubbed error text.

export interface DatabaseHealth {
  ok: boolean
  kind: DatabaseKind
  latencyMs: number | null
  migrations: { applied: number, expected: number, latest: string | null } | null
}

export interface MailHealth {
  transport: 'smtp' | 'stand-in'
  /** Waiting to be sent, including those waiting for a retry. */
  queued: number
  /** Queued messages whose last attempt failed (they are being retried). */
  failing: number
  /** Messages given up on after every retry. */
  failed: number
  oldestQueuedSeconds: number
  lastError?: string
}

/** Background work shared by every instance on the database (server/services/background.ts). */
export interface WorkHealth {
  /** Outlooks queued or being computed. */
  outlooksRunning: number
  /** Jobs queued, waiting on outlooks or running. */
  jobsPending: number
  /** Jobs given up on after every retry (their error is in the server log). */
  jobsFailed: number
}

export interface Health {
  status: 'ok' | 'degraded' | 'down'
  database: DatabaseHealth
  mail: MailHealth | null
  work: WorkHealth | null
}

const PROBE_TIMEOUT_MS = 3_000
/** Mail older than this still unsent means the sender is not keeping up. */
const MAIL_STALE_SECONDS = 15 * 60

function withTimeout<T>(work: Promise<T>, ms: number, what: string): Promise<T> {
  let timer: NodeJS.Timeout | undefined
  const timeout = new Promise<never>((_, reject) => {
    timer = setTimeout(() => reject(new Error(`${what} did not answer within ${ms} ms`)), ms)
  })
  return Promise.race([work, timeout]).finally(() => clearTimeout(timer))
}

interface JournalEntry { when: number, tag: string }

async function migrationJournal(): Promise<JournalEntry[]> {
  const journal = await useStorage('assets:migrations').getItem<{ entries: JournalEntry[] }>('meta:_journal.json')
  return journal?.entries ?? []
}

async function probeDatabase(handle: DatabaseHandle): Promise<DatabaseHealth> {
  const started = performance.now()
  // drizzle's migrators (PGlite and node-postgres alike) record applied migrations here.
  const result = await handle.db.execute(
    sql`select count(*)::int as applied, max(created_at)::float8 as latest from drizzle.__drizzle_migrations`,
  )
  const latencyMs = Math.round((performance.now() - started) * 10) / 10
  const row = (result as unknown as { rows: Array<{ applied: number, latest: number | null }> }).rows[0]
  const journal = await migrationJournal()
  const latest = journal.find(entry => entry.when === Number(row?.latest))?.tag ?? null
  return {
    ok: true,
    kind: handle.kind,
    latencyMs,
    migrations: { applied: Number(row?.applied ?? 0), expected: journal.length, latest },
  }
}

async function probeMail(): Promise<MailHealth> {
  const db = await useDb()
  const [counts] = await db
    .select({
      queued: sql<number>`count(*) filter (where ${mailOutbox.state} = 'queued')::int`.mapWith(Number),
      failing:
        sql<number>`count(*) filter (where ${mailOutbox.state} = 'queued' and ${mailOutbox.attempts} > 0)::int`.mapWith(
          Number,
        ),
      failed: sql<number>`count(*) filter (where ${mailOutbox.state} = 'failed')::int`.mapWith(Number),
      oldest:
        sql<number>`coalesce(extract(epoch from now() - min(${mailOutbox.createdAt}) filter (where ${mailOutbox.state} = 'queued')), 0)::float8`.mapWith(
          Number,
        ),
    })
    .from(mailOutbox)
  const [latestError] = await db.select({ lastError: mailOutbox.lastError }).from(mailOutbox)
    .where(and(eq(mailOutbox.state, 'queued'), gt(mailOutbox.attempts, 0)))
    .orderBy(sql`${mailOutbox.nextAttemptAt} desc`).limit(1)
  return {
    transport: serverConfig().SMTP_URL ? 'smtp' : 'stand-in',
    queued: counts?.queued ?? 0,
    failing: counts?.failing ?? 0,
    failed: counts?.failed ?? 0,
    oldestQueuedSeconds: Math.round(counts?.oldest ?? 0),
    ...(latestError?.lastError ? { lastError: scrubError(latestError.lastError) } : {}),
  }
}

async function probeWork(): Promise<WorkHealth> {
  const db = await useDb()
  const [[outlookCounts], [jobCounts]] = await Promise.all([
    db
      .select({ running: sql<number>`count(*)::int`.mapWith(Number) })
      .from(outlooks)
      .where(eq(outlooks.state, 'running')),
    db
      .select({
        pending: sql<number>`count(*) filter (where ${jobs.state} in ('queued', 'running'))::int`.mapWith(Number),
        failed: sql<number>`count(*) filter (where ${jobs.state} = 'failed')::int`.mapWith(Number),
      })
      .from(jobs),
  ])
  return {
    outlooksRunning: outlookCounts?.running ?? 0,
    jobsPending: jobCounts?.pending ?? 0,
    jobsFailed: jobCounts?.failed ?? 0,
  }
}

export async function checkHealth(): Promise<Health> {
  let database: DatabaseHealth
  try {
    // Opening waits for migration and seeding at start, so the first answer means ready.
    const handle = await useDbHandle()
    database = await withTimeout(probeDatabase(handle), PROBE_TIMEOUT_MS, 'The database')
  }
  catch {
    return {
      status: 'down',
      database: {
        ok: false,
        kind: serverConfig().DATABASE_URL ? 'postgresql' : 'pglite',
        latencyMs: null,
        migrations: null,
      },
      mail: null,
      work: null,
    }
  }
  const [mail, work] = await Promise.all([
    withTimeout(probeMail(), PROBE_TIMEOUT_MS, 'The mail outbox').catch(() => null),
    withTimeout(probeWork(), PROBE_TIMEOUT_MS, 'The job queue').catch(() => null),
  ])
  const degraded = !mail || mail.failing > 0 || mail.oldestQueuedSeconds > MAIL_STALE_SECONDS
    || (database.migrations !== null && database.migrations.applied < database.migrations.expected)
  return { status: degraded ? 'degraded' : 'ok', database, mail, work }
}
