import { EventEmitter } from 'node:events'
import { and, asc, eq, inArray, isNull, lt, or, sql } from 'drizzle-orm'
import { outlooks, sites, thresholds } from '~~/server/db/schema'
import { EngineInputError, type OutlookResult } from '#shared/engine'
import { headlineOf } from '../services/site-list'
import { queueOutlookTipping } from '../services/pathways/evaluation'
import { runOutlookOffThread } from './pool'

// A stored outlook in state `running` is its own job. Any app instance claims one by taking its
// lease under a row lock with SKIP LOCKED (two instances never take the same one), renews the
// lease while the worker threads sample, and writes the result only if it still holds the lease.
// An instance that dies leaves a lease that runs out; another instance (or this one, restarted)
// then computes it again: the engine is deterministic, so the numbers are the same.

/** Give up on an outlook whose computation keeps killing the instance running it. */
export const MAX_OUTLOOK_ATTEMPTS = 3
const POLL_FINISHED_MS = 250

const finished = new EventEmitter()
finished.setMaxListeners(0)

/**
 * Fair share between organisations: of those with outlooks waiting, the one served longest ago (or
 * never) goes first, and within it the oldest request. One planner's backlog therefore delays
 * another organisation's outlook by at most the one being computed now, whatever its length.
 */
async function organisationsInTurn(tx: Tx): Promise<string[]> {
  const result = await tx.execute(sql`
    select waiting.organisation_id as organisation
    from (
      select s.organisation_id, min(o.created_at) as oldest
      from outlooks o join sites s on s.id = o.site_id
      where o.state = 'running' and (o.lease_until is null or o.lease_until < now())
      group by s.organisation_id
    ) waiting
    left join lateral (
      select max(o.claimed_at) as served
      from outlooks o join sites s on s.id = o.site_id
      where s.organisation_id = waiting.organisation_id
    ) last on true
    order by last.served asc nulls first, waiting.oldest asc`)
  return (result as unknown as { rows: { organisation: string }[] }).rows.map(row => row.organisation)
}

type Tx = Parameters<Parameters<Awaited<ReturnType<typeof useDb>>['transaction']>[0]>[0]

async function claimOutlook() {
  const db = await useDb()
  return db.transaction(async (tx) => {
    for (const organisation of await organisationsInTurn(tx)) {
      const now = new Date()
      const [due] = await tx
        .select({ id: outlooks.id })
        .from(outlooks)
        .where(
          and(
            eq(outlooks.state, 'running'),
            or(isNull(outlooks.leaseUntil), lt(outlooks.leaseUntil, now)),
            inArray(
              outlooks.siteId,
              tx.select({ id: sites.id }).from(sites).where(eq(sites.organisationId, organisation)),
            ),
          ),
        )
        .orderBy(asc(outlooks.createdAt))
        .limit(1)
        .for('update', { skipLocked: true })
      if (!due) continue
      const [claimed] = await tx
        .update(outlooks)
        .set({
          claimedBy: INSTANCE_ID,
          claimedAt: now,
          leaseUntil: new Date(now.getTime() + jobLeaseMs()),
          attempts: sql`${outlooks.attempts} + 1`,
          progress: 0,
        })
        .where(eq(outlooks.id, due.id))
        .returning()
      return claimed ?? null
    }
    return null
  })
}

type ClaimedOutlook = NonNullable<Awaited<ReturnType<typeof claimOutlook>>>

/** The update only lands while this instance still holds the outlook's lease. */
const stillMine = (id: string) =>
  and(eq(outlooks.id, id), eq(outlooks.state, 'running'), eq(outlooks.claimedBy, INSTANCE_ID))

async function compute(row: ClaimedOutlook) {
  const db = await useDb()
  if (row.attempts > MAX_OUTLOOK_ATTEMPTS) {
    await db
      .update(outlooks)
      .set({
        state: 'failed',
        error: `The computation stopped ${row.attempts - 1} times before finishing; ask an administrator to look at the server's logs.`,
        finishedAt: new Date(),
        leaseUntil: null,
      })
      .where(stillMine(row.id))
    return
  }
  const started = performance.now()
  let lastBeat = 0
  const heartbeat = (fraction: number) => {
    // Progress for the outlook page, and a longer lease while the work goes on.
    if (performance.now() - lastBeat < 500) return
    lastBeat = performance.now()
    db.update(outlooks)
      .set({ progress: fraction, leaseUntil: new Date(Date.now() + jobLeaseMs()) })
      .where(stillMine(row.id))
      .catch(error => console.error('[brinkwater] outlook heartbeat failed:', error))
  }
  try {
    const result: OutlookResult = await runOutlookOffThread(row.input, heartbeat)
    const labels = await db
      .select({ id: thresholds.id, label: thresholds.label })
      .from(thresholds)
      .where(eq(thresholds.siteId, row.siteId))
    const stored = await db.transaction(async (tx) => {
      const [written] = await tx
        .update(outlooks)
        .set({
          state: 'done',
          result,
          headline: headlineOf(result, new Map(labels.map(t => [t.id, t.label])), row.input.datum?.offset ?? 0),
          durationMs: Math.round(performance.now() - started),
          finishedAt: new Date(),
          leaseUntil: null,
          progress: null,
        })
        .where(stillMine(row.id))
        .returning({ id: outlooks.id })
      if (written) {
        // What follows from a new outlook is computed now rather than when someone reads it: the
        // site's measures' tipping years, and which issued briefings it makes out of date.
        await queueOutlookTipping(tx, row.id, row.siteId)
        await enqueueJob(tx, 'outlook-finished', { outlookId: row.id, siteId: row.siteId })
      }
      faultPoint('outlook-write')
      return written !== undefined
    })
    if (stored) kickJobs()
  }
  catch (error) {
    const message
      = error instanceof EngineInputError
        ? error.message
        : 'The computation failed; try again, and tell an administrator if it keeps failing.'
    if (!(error instanceof EngineInputError)) console.error('[brinkwater] outlook failed', error)
    await db
      .update(outlooks)
      .set({ state: 'failed', error: message, finishedAt: new Date(), leaseUntil: null, progress: null })
      .where(stillMine(row.id))
  }
  finally {
    finished.emit(row.id)
  }
}

let running: Promise<void> | null = null
let again = false

/**
 * Computes queued outlooks one at a time (each already uses every worker thread); calls made
 * while a pass runs fold into one more pass.
 */
export function kickOutlooks(): Promise<void> {
  if (running) {
    again = true
    return running
  }
  running = (async () => {
    for (let row = await claimOutlook(); row; row = await claimOutlook()) await compute(row)
  })().catch(error => console.error('[brinkwater] outlook pass failed:', error)).finally(() => {
    running = null
    if (again) {
      again = false
      kickOutlooks()
    }
  })
  return running
}

/** Resolves when the outlook is done or failed, whichever instance computes it. */
export async function awaitOutlook(id: string): Promise<void> {
  const db = await useDb()
  for (;;) {
    const [row] = await db.select({ state: outlooks.state }).from(outlooks).where(eq(outlooks.id, id))
    if (!row || row.state !== 'running') return
    // Woken at once when this instance finishes it; polled when another instance holds it.
    await new Promise<void>((resolve) => {
      const done = () => {
        clearTimeout(timer)
        finished.off(id, done)
        resolve()
      }
      const timer = setTimeout(done, POLL_FINISHED_MS)
      finished.on(id, done)
    })
  }
}
