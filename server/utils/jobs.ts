import { randomUUID } from 'node:crypto'
import { hostname } from 'node:os'
import { jobs } from '../db/schema'
import type { Database } from '../db/client'

/** Names this app instance in leases, so several instances on one database can tell theirs apart. */
export const INSTANCE_ID = `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`

/** How long a claimed job or outlook stays claimed without a heartbeat (JOB_LEASE_MS). */
export const jobLeaseMs = () => serverConfig().JOB_LEASE_MS

export type JobKind = 'science-change' | 'recompute-site' | 'briefing-issued' | 'password-reset'

/**
 * Queues background work in the caller's transaction, so the work exists if and only if the
 * change that causes it was committed. Run by server/services/background.ts.
 */
export async function enqueueJob(executor: Pick<Database, 'insert'>, kind: JobKind, payload: Record<string, unknown>, recomputationId?: string) {
  await executor.insert(jobs).values({ kind, payload, recomputationId: recomputationId ?? null })
}

let wake: () => unknown = () => {}

/** Wakes this instance's job runner after a commit that queued work (the runner also polls). */
export function kickJobs() {
  wake()
}

/** Called once by server/plugins/jobs.ts, which owns the runner. */
export function setJobRunner(runner: () => unknown) {
  wake = runner
}
