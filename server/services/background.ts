import { and, asc, eq, isNull, lt, lte, or } from 'drizzle-orm'
import { jobs } from '~~/server/db/schema'
import { languageOf } from '#shared/wording/translate'
import { sendPasswordReset } from './accounts'
import type { JobPayloads } from '~~/server/utils/jobs'
import { mailBriefingIssued } from './notify'
import { kickOutlooks } from '../outlooks/run'
import { recomputeSite, startRecomputation, type JobOutcome } from './recompute'
import { runTippingEvaluation } from './pathways/evaluation'
import { refreshSiteStaleness, refreshStaleness } from './briefing-staleness'

// Runs the durable jobs (server/utils/jobs.ts) on any app instance: claimed one at a time under a
// lease with SKIP LOCKED, so each runs once however many instances share the database. A job that
// throws is retried with backoff; one whose instance died is taken over when its lease runs out.

export const MAX_JOB_ATTEMPTS = 5

const HANDLERS: { [Kind in JobKind]: (payload: JobPayloads[Kind]) => Promise<JobOutcome> } = {
  'science-change': async ({ scenario, cause, requestedBy, seriesId, correlationSource }) => {
    const db = await useDb()
    await db.transaction(tx =>
      startRecomputation(tx, { scenario, cause, requestedBy: requestedBy ?? null, seriesId, correlationSource }),
    )
    return { state: 'done' }
  },
  'recompute-site': payload => recomputeSite(payload),
  'password-reset': async (payload) => {
    await sendPasswordReset(payload.email, languageOf(payload.language))
    return { state: 'done' }
  },
  'briefing-issued': async (payload) => {
    await mailBriefingIssued(payload.briefingId)
    // Issued from outlooks that a newer one may already have replaced.
    await refreshStaleness(payload.briefingId)
    return { state: 'done' }
  },
  'tipping-evaluation': async (payload) => {
    await runTippingEvaluation(payload.evaluationId)
    return { state: 'done' }
  },
  'outlook-finished': async (payload) => {
    await refreshSiteStaleness(payload.siteId)
    return { state: 'done' }
  },
}

async function claimJob() {
  const db = await useDb()
  const now = new Date()
  return db.transaction(async (tx) => {
    const [due] = await tx.select({ id: jobs.id }).from(jobs)
      .where(or(
        and(eq(jobs.state, 'queued'), lte(jobs.runAfter, now)),
        and(eq(jobs.state, 'running'), or(isNull(jobs.leaseUntil), lt(jobs.leaseUntil, now))),
      ))
      .orderBy(asc(jobs.runAfter)).limit(1).for('update', { skipLocked: true })
    if (!due) return null
    const [claimed] = await tx
      .update(jobs)
      .set({ state: 'running', claimedBy: INSTANCE_ID, leaseUntil: new Date(now.getTime() + jobLeaseMs()) })
      .where(eq(jobs.id, due.id))
      .returning()
    return claimed ?? null
  })
}

type Job = NonNullable<Awaited<ReturnType<typeof claimJob>>>
const stillMine = (id: string) => and(eq(jobs.id, id), eq(jobs.state, 'running'), eq(jobs.claimedBy, INSTANCE_ID))

async function runJob(job: Job) {
  const db = await useDb()
  try {
    // The row's kind says which payload it holds (written by enqueueJob, or by a re-queue of its own kind).
    const outcome = await (HANDLERS[job.kind as JobKind] as (payload: unknown) => Promise<JobOutcome>)(job.payload)
    if (outcome.state === 'done') {
      await db
        .update(jobs)
        .set({ state: 'done', finishedAt: new Date(), leaseUntil: null, error: null })
        .where(stillMine(job.id))
    }
    else {
      await db
        .update(jobs)
        .set({
          state: 'queued',
          payload: outcome.payload,
          runAfter: new Date(Date.now() + outcome.retryInMs),
          leaseUntil: null,
        })
        .where(stillMine(job.id))
    }
  }
  catch (error) {
    console.error(`[brinkwater] ${job.kind} job failed:`, error)
    const attempts = job.attempts + 1
    await db.update(jobs).set({
      attempts, error: error instanceof Error ? error.message : String(error), leaseUntil: null,
      state: attempts >= MAX_JOB_ATTEMPTS ? 'failed' : 'queued', runAfter: new Date(Date.now() + 1000 * 2 ** attempts),
      ...(attempts >= MAX_JOB_ATTEMPTS ? { finishedAt: new Date() } : {}),
    }).where(stillMine(job.id))
  }
}

let running: Promise<void> | null = null
let again = false

/** Runs what is due now, then looks for due outlooks; calls made during a pass fold into one more. */
export function kickBackgroundWork(): Promise<void> {
  kickOutlooks()
  if (running) {
    again = true
    return running
  }
  running = (async () => {
    for (let job = await claimJob(); job; job = await claimJob()) {
      await runJob(job)
      kickOutlooks()
    }
  })().catch(error => console.error('[brinkwater] job pass failed:', error)).finally(() => {
    running = null
    if (again) {
      again = false
      kickBackgroundWork()
    }
  })
  return running
}
