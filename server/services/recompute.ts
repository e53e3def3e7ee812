import { and, eq, inArray } from 'drizzle-orm'
import { correlationAdoptions, jobs, outlooks, recomputations, seriesAdoptions, sites } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import { mailStaleBriefings } from './briefing-staleness'
import type { RecomputeSitePayload, ScienceChangePayload } from '~~/server/utils/jobs'
import type { RecomputationCause } from '#shared/types/causes'
import { latestOutlooks, mailWhatChanged, type Comparison } from './notify'
import { queueOutlook } from '../outlooks/queue'
import { checkDecisionAlerts } from './pathways/alerts'
import { siteWithThresholds } from './sites'
import type { CurrentUser } from '../utils/auth'

// When the science or a site changes, every site with an outlook it affects gets that outlook
// computed again with the same samples and seed, and the people watching the site are told what
// changed. A change in the science is one recomputation (a batch the admin page follows) with a
// job per site; the outlooks themselves are computed by whichever instance claims them.

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0]

const FIRST_WAIT_MS = 500
const MAX_WAIT_MS = 5000

export interface RecomputationScope {
  scenario: string | null
  /** Only sites of organisations that adopted this series of releases (a new version or withdrawal there). */
  seriesId?: string
  /** Only sites of organisations that adopted this organisation's correlation sets for the scenario. */
  correlationSource?: string
}

/** The sites with a finished outlook of the scenario (null: any) that a change in the science reaches. */
export function reachedSites(db: Pick<Tx, 'select' | 'selectDistinct'>, scope: RecomputationScope) {
  const conditions = [eq(outlooks.state, 'done')]
  if (scope.scenario) conditions.push(eq(outlooks.scenario, scope.scenario))
  if (scope.seriesId) {
    conditions.push(
      inArray(
        sites.organisationId,
        db
          .select({ id: seriesAdoptions.organisationId })
          .from(seriesAdoptions)
          .where(eq(seriesAdoptions.seriesId, scope.seriesId)),
      ),
    )
  }
  if (scope.correlationSource && scope.scenario) {
    conditions.push(
      inArray(
        sites.organisationId,
        db
          .select({ id: correlationAdoptions.organisationId })
          .from(correlationAdoptions)
          .where(
            and(
              eq(correlationAdoptions.sourceOrganisationId, scope.correlationSource),
              eq(correlationAdoptions.scenario, scope.scenario),
            ),
          ),
      ),
    )
  }
  return db
    .selectDistinct({ siteId: outlooks.siteId })
    .from(outlooks)
    .innerJoin(sites, eq(sites.id, outlooks.siteId))
    .where(and(...conditions))
}

/** Queues one recompute-site job per site the change reaches (see reachedSites). */
export async function startRecomputation(
  tx: Tx,
  options: RecomputationScope & { cause: ScienceChangePayload['cause'], requestedBy: string | null },
) {
  const siteIds = (await reachedSites(tx, options)).map(row => row.siteId)
  const [batch] = await tx
    .insert(recomputations)
    .values({
      scenario: options.scenario,
      cause: options.cause,
      requestedBy: options.requestedBy,
      siteCount: siteIds.length,
    })
    .returning({ id: recomputations.id })
  if (siteIds.length) {
    await tx.insert(jobs).values(
      siteIds.map(siteId => ({
        kind: 'recompute-site',
        recomputationId: batch!.id,
        payload: {
          siteId,
          cause: options.cause,
          ...(options.scenario ? { scenarios: [options.scenario] } : {}),
        } satisfies RecomputeSitePayload,
      })),
    )
  }
  return batch!.id
}

/** An operator's recomputation (after an engine upgrade, say), audited in the same transaction. */
export async function requestRecomputation(
  operator: CurrentUser,
  options: { scenario: string | null, cause: RecomputationCause },
) {
  const db = await useDb()
  return db.transaction(async (tx) => {
    const batchId = await startRecomputation(tx, { ...options, requestedBy: operator.id })
    await writeAudit(
      tx,
      operator,
      'recomputation.started',
      { type: 'recomputation', id: batchId },
      { scenario: options.scenario },
    )
    return batchId
  })
}

export type JobOutcome = { state: 'done' } | { state: 'waiting', payload: RecomputeSitePayload, retryInMs: number }

/**
 * First pass: queue a new outlook for each of the site's latest ones (a science change that does
 * not touch an outlook's inputs finds the stored one and changes nothing). Later passes wait until
 * those are computed, then mail the watchers once.
 */
export async function recomputeSite(payload: RecomputeSitePayload): Promise<JobOutcome> {
  if (!payload.pairs) {
    const site = await siteWithThresholds(payload.siteId)
    if (!site) return { state: 'done' }
    const pairs: RecomputeSitePayload['pairs'] = []
    for (const before of await latestOutlooks(payload.siteId)) {
      if (payload.scenarios && !payload.scenarios.includes(before.scenario)) continue
      // A scenario left incomplete by a withdrawal cannot be computed: its outlook stays as it was.
      const queued = await queueOutlook(site, before, null).catch(() => null)
      if (queued && queued.id !== before.id) pairs.push({ before: before.id, after: queued.id })
    }
    return pairs.length
      ? { state: 'waiting', payload: { ...payload, pairs }, retryInMs: FIRST_WAIT_MS }
      : { state: 'done' }
  }
  const db = await useDb()
  // A light look first: while any new outlook is still being computed, wait longer each time, so a
  // batch of hundreds of sites does not keep the database busy asking.
  const afters = payload.pairs.map(pair => pair.after)
  const states = await db
    .select({ id: outlooks.id, state: outlooks.state })
    .from(outlooks)
    .where(inArray(outlooks.id, afters))
  if (states.some(row => row.state === 'running')) {
    const checks = (payload.checks ?? 0) + 1
    return {
      state: 'waiting',
      payload: { ...payload, checks },
      retryInMs: Math.min(MAX_WAIT_MS, FIRST_WAIT_MS * 2 ** (checks - 1)),
    }
  }
  const ids = payload.pairs.flatMap(pair => [pair.before, pair.after])
  const rows = new Map((await db.select().from(outlooks).where(inArray(outlooks.id, ids))).map(row => [row.id, row]))
  const comparisons: Comparison[] = payload.pairs.flatMap(({ before, after }) => {
    const old = rows.get(before)
    const now = rows.get(after)
    return old && now?.state === 'done' ? [{ scenario: now.scenario, before: old, after: now }] : []
  })
  await mailWhatChanged(payload.siteId, payload.cause, comparisons)
  await checkDecisionAlerts(payload.siteId, payload.cause, comparisons)
  // Issued briefings that the new numbers make out of date tell their planners (once per change).
  if (comparisons.length) await mailStaleBriefings(payload.siteId)
  return { state: 'done' }
}
