import { and, count, eq, isNotNull } from 'drizzle-orm'
import { organisations, outlooks, sites } from '~~/server/db/schema'
import { ENGINE_VERSION } from '#shared/engine/version'
import type { OutlookRequest } from '#shared/schemas/sites'
import type { CurrentUser } from '../utils/auth'
import { loadSite } from '../services/sites'
import { assembleOutlook, type Site } from './assemble'
import { awaitOutlook, kickOutlooks } from './run'

/**
 * Runs an outlook, or finds the stored one with the same input hash. The run itself is queued
 * (see run.ts: any app instance may compute it); `run` resolves when it has finished.
 */
export async function requestOutlook(planner: CurrentUser, siteId: string, request: OutlookRequest) {
  const site = await loadSite(planner, siteId)
  const queued = await queueOutlook(site, request, planner.id)
  if (queued.cached) return { id: queued.id, cached: true, run: null }
  const db = await useDb()
  await writeAudit(
    db,
    planner,
    'outlook.requested',
    { type: 'outlook', id: queued.id },
    { site: siteId, scenario: request.scenario, samples: request.samples },
  )
  return { id: queued.id, cached: false, run: awaitOutlook(queued.id) }
}

/**
 * Stores a new outlook to be computed (state running, no lease), unless one with the same input
 * hash is stored already: then that one is the answer. A failed one is replaced.
 */
export async function queueOutlook(
  site: Site,
  request: Pick<OutlookRequest, 'scenario' | 'samples' | 'seed'>,
  requestedBy: string | null,
) {
  const assembled = await assembleOutlook(site, request as OutlookRequest)
  const db = await useDb()
  const [stored] = await db
    .select({ id: outlooks.id, state: outlooks.state })
    .from(outlooks)
    .where(and(eq(outlooks.siteId, site.id), eq(outlooks.inputHash, assembled.inputHash)))
  if (stored && stored.state !== 'failed') return { id: stored.id, cached: true }
  if (stored) await db.delete(outlooks).where(and(eq(outlooks.id, stored.id), eq(outlooks.state, 'failed')))
  const [row] = await db.transaction(async (tx) => {
    // A person's request waits its turn within their organisation's quota; the organisation's row
    // lock makes the count and the insert one step, so a burst of requests cannot all pass.
    if (requestedBy) await assertOutlookQuota(tx, site.organisationId)
    return tx
      .insert(outlooks)
      .values({
        siteId: site.id,
        scenario: request.scenario,
        samples: request.samples,
        seed: request.seed,
        inputHash: assembled.inputHash,
        engineVersion: ENGINE_VERSION,
        input: assembled.input,
        releaseRefs: assembled.releaseRefs,
        notes: assembled.notes,
        correlationSetId: assembled.correlationSetId,
        requestedBy,
      })
      .onConflictDoNothing()
      .returning({ id: outlooks.id })
  })
  if (!row) {
    // Someone (here or on another instance) asked for the same outlook a moment ago: follow that run.
    const [twin] = await db
      .select({ id: outlooks.id })
      .from(outlooks)
      .where(and(eq(outlooks.siteId, site.id), eq(outlooks.inputHash, assembled.inputHash)))
    return { id: twin!.id, cached: true }
  }
  kickOutlooks()
  return { id: row.id, cached: false }
}

/**
 * How many outlooks people of one organisation may have waiting or computing at once (OUTLOOK_QUEUE_PER_ORGANISATION).
 */
export const outlookQueueQuota = () => serverConfig().OUTLOOK_QUEUE_PER_ORGANISATION

type Tx = Parameters<Parameters<Awaited<ReturnType<typeof useDb>>['transaction']>[0]>[0]

/** 429 when the organisation already has its quota of requested outlooks waiting or computing. */
async function assertOutlookQuota(tx: Tx, organisationId: string) {
  await tx
    .select({ id: organisations.id })
    .from(organisations)
    .where(eq(organisations.id, organisationId))
    .for('update')
  const [{ waiting } = { waiting: 0 }] = await tx
    .select({ waiting: count() })
    .from(outlooks)
    .innerJoin(sites, eq(sites.id, outlooks.siteId))
    .where(
      and(eq(sites.organisationId, organisationId), eq(outlooks.state, 'running'), isNotNull(outlooks.requestedBy)),
    )
  const quota = outlookQueueQuota()
  if (waiting >= quota) {
    throw createError({
      statusCode: 429,
      message: `Your organisation already has ${waiting} outlooks waiting or computing, the most it may queue at once (${quota}). Wait for one of them to finish, then ask again; stored outlooks open at once.`,
      data: { waiting, quota },
    })
  }
}
