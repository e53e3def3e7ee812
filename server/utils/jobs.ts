import { randomUUID } from 'node:crypto'
import { hostname } from 'node:os'
import { jobs } from '../db/schema'
import type { Database } from '../db/client'
import type { StoredCause } from '#shared/types/causes'
import type { Language } from '#shared/wording/translate'

/** Names this app instance in leases, so several instances on one database can tell theirs apart. */
export const INSTANCE_ID = `${hostname()}:${process.pid}:${randomUUID().slice(0, 8)}`

/** How long a claimed job or outlook stays claimed without a heartbeat (JOB_LEASE_MS). */
export const jobLeaseMs = () => serverConfig().JOB_LEASE_MS

// Payloads are types rather than interfaces so that they fit the jsonb column's Record<string, unknown>.
// Payloads hold facts (ids, versions, a cause), never sentences: they are worded when the mail is
// made, in each reader's language. Jobs queued before causes were facts carry `cause` as the
// sentence in each language; StoredCause admits that shape and causeSentence words it as stored.

/** Published or withdrawn science: fans out into a recomputation (server/services/recompute.ts). */
export type ScienceChangePayload = {
  /** null: every scenario (a scale-factor grid). */
  scenario: string | null
  cause: StoredCause
  requestedBy?: string
  /** Only organisations that adopted this series (a release). */
  seriesId?: string
  /** Only organisations that adopted this organisation's correlation sets for the scenario. */
  correlationSource?: string
}

export type RecomputeSitePayload = {
  siteId: string
  /** Only these scenarios' outlooks; all of the site's when absent. */
  scenarios?: string[]
  cause: StoredCause
  /** Filled by the job's first pass: each latest outlook and the outlook queued to replace it. */
  pairs?: Array<{ before: string, after: string }>
  /** How many times the job has found its outlooks still running. */
  checks?: number
}

/** Each kind of job and what it carries. */
export interface JobPayloads {
  'science-change': ScienceChangePayload
  'recompute-site': RecomputeSitePayload
  'briefing-issued': { briefingId: string }
  /** A site's measures' chances under one outlook (server/services/pathways/evaluation.ts). */
  'tipping-evaluation': { evaluationId: string }
  /** An outlook finished: its site's issued briefings learn whether it makes them out of date. */
  'outlook-finished': { outlookId: string, siteId: string }
  'password-reset': { email: string, language: Language }
}

export type JobKind = keyof JobPayloads

/**
 * Queues background work in the caller's transaction, so the work exists if and only if the
 * change that causes it was committed. Run by server/services/background.ts.
 */
export async function enqueueJob<Kind extends JobKind>(
  executor: Pick<Database, 'insert'>,
  kind: Kind,
  payload: JobPayloads[Kind],
  recomputationId?: string,
) {
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
