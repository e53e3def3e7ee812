import { and, eq, type SQL } from 'drizzle-orm'
import { correlationSets, releases, scaleFactorGrids, series, storylines } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import type { RecomputationCause } from '#shared/types/causes'
import { judgeReviewAction, type ReviewAction, type ReviewedKind } from '#shared/review/rules'
import type { CurrentUser } from '../utils/auth'

export type { ReviewedKind }

// One review workflow for the four kinds of reviewed records. Publishing a version supersedes
// the previously published version of the same series in the same transaction.

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0]

const TABLES = {
  'release': releases,
  'correlation-set': correlationSets,
  'scale-factor-grid': scaleFactorGrids,
  'storyline': storylines,
} as const
type ReviewedTable = typeof TABLES[ReviewedKind]

export const KIND_LABEL: Record<ReviewedKind, string> = {
  'release': 'release',
  'correlation-set': 'correlation set',
  'scale-factor-grid': 'scale-factor grid',
  'storyline': 'storyline',
}

/** Rows that belong to the same series as `row`: the versions one publication supersedes. */
async function sameSeries(tx: Tx, kind: ReviewedKind, id: string): Promise<SQL> {
  if (kind === 'release') {
    const [row] = await tx.select({ seriesId: releases.seriesId }).from(releases).where(eq(releases.id, id))
    return eq(releases.seriesId, row!.seriesId)
  }
  if (kind === 'storyline') {
    const [row] = await tx
      .select({ org: storylines.organisationId, scenario: storylines.scenario, name: storylines.name })
      .from(storylines)
      .where(eq(storylines.id, id))
    return and(
      eq(storylines.organisationId, row!.org),
      eq(storylines.scenario, row!.scenario),
      eq(storylines.name, row!.name),
    )!
  }
  if (kind === 'correlation-set') {
    const [row] = await tx
      .select({ org: correlationSets.organisationId, scenario: correlationSets.scenario })
      .from(correlationSets)
      .where(eq(correlationSets.id, id))
    return and(eq(correlationSets.organisationId, row!.org), eq(correlationSets.scenario, row!.scenario))!
  }
  const [row] = await tx
    .select({ org: scaleFactorGrids.organisationId, component: scaleFactorGrids.component })
    .from(scaleFactorGrids)
    .where(eq(scaleFactorGrids.id, id))
  return and(eq(scaleFactorGrids.organisationId, row!.org), eq(scaleFactorGrids.component, row!.component))!
}

const AUDIT_VERB: Record<ReviewAction, string> = {
  submit: 'submitted',
  approve: 'published',
  return: 'returned',
  withdraw: 'withdrawn',
}

export interface ReviewPayload { note?: string, reason?: string }

export async function applyReviewAction(
  kind: ReviewedKind,
  id: string,
  action: ReviewAction,
  actor: CurrentUser,
  payload: ReviewPayload = {},
) {
  const db = await useDb()
  const table: ReviewedTable = TABLES[kind]
  const updated = await db.transaction(async (tx) => {
    // Lock the row so two reviewers cannot both publish, or publish and withdraw, at once.
    const [row] = await tx
      .select({
        id: table.id,
        state: table.state,
        authorId: table.authorId,
        coauthorIds: table.coauthorIds,
        version: table.version,
        organisationId: table.organisationId,
      })
      .from(table)
      .where(eq(table.id, id))
      .for('update')
    if (!row || row.organisationId !== actor.organisationId) {
      throw createError({ statusCode: 404, message: `No such ${KIND_LABEL[kind]}.` })
    }
    const verdict = judgeReviewAction(action, row, actor)
    if (!verdict.ok) throw createError({ statusCode: verdict.status, message: verdict.message })

    const now = new Date()
    if (action === 'approve') {
      const previous = await tx
        .update(table)
        .set({ state: 'superseded', supersededAt: now, updatedAt: now })
        .where(and(await sameSeries(tx, kind, id), eq(table.state, 'published')))
        .returning({ id: table.id, version: table.version })
      for (const old of previous) {
        await writeAudit(tx, actor, `${kind}.superseded`, { type: kind, id: old.id }, { version: old.version, by: id })
      }
    }
    const changes = {
      submit: { state: 'in-review', submittedAt: now, reviewNote: null },
      approve: { state: 'published', publishedAt: now, reviewerId: actor.id },
      return: { state: 'draft', reviewNote: payload.note ?? null },
      withdraw: { state: 'withdrawn', withdrawnAt: now, withdrawalReason: payload.reason ?? null },
    } as const
    const [updated] = await tx
      .update(table)
      .set({ ...changes[action], updatedAt: now })
      .where(eq(table.id, id))
      .returning({ id: table.id, state: table.state, version: table.version })
    await writeAudit(
      tx,
      actor,
      `${kind}.${AUDIT_VERB[action]}`,
      { type: kind, id },
      { version: row.version, from: row.state, to: verdict.to, ...payload },
    )
    // A storyline is never sampled: publishing one changes no outlook, so nothing is recomputed or mailed.
    if ((action === 'approve' || action === 'withdraw') && kind !== 'storyline') {
      // The recomputation is queued in this transaction: it happens if and only if the change lands.
      await enqueueJob(tx, 'science-change', { ...(await scienceChange(tx, kind, id, action)), requestedBy: actor.id })
      faultPoint('release-publish')
    }
    return updated!
  })
  if ((action === 'approve' || action === 'withdraw') && kind !== 'storyline') kickJobs()
  return updated
}

/**
 * Published or withdrawn science changes outlooks: which scenario (null: every scenario, for a
 * scale-factor grid) and why, as facts the "what changed" e-mails word in each watcher's language.
 */
async function scienceChange(
  tx: Tx,
  kind: Exclude<ReviewedKind, 'storyline'>,
  id: string,
  action: 'approve' | 'withdraw',
) {
  const done = action === 'approve' ? 'published' : 'withdrawn'
  if (kind === 'release') {
    const [row] = await tx
      .select({
        scenario: series.scenario,
        component: series.component,
        version: releases.version,
        seriesId: series.id,
      })
      .from(releases)
      .innerJoin(series, eq(series.id, releases.seriesId))
      .where(eq(releases.id, id))
    const cause: RecomputationCause = {
      kind: 'release',
      action: done,
      component: row!.component,
      version: row!.version,
      scenario: row!.scenario,
    }
    // Only organisations that adopted this series are reached: another series is offered, not applied.
    return { scenario: row!.scenario, seriesId: row!.seriesId, cause }
  }
  if (kind === 'correlation-set') {
    const [row] = await tx
      .select({ scenario: correlationSets.scenario, organisationId: correlationSets.organisationId })
      .from(correlationSets)
      .where(eq(correlationSets.id, id))
    const cause: RecomputationCause = { kind: 'correlation-set', action: done, scenario: row!.scenario }
    return { scenario: row!.scenario, correlationSource: row!.organisationId, cause }
  }
  const [row] = await tx
    .select({ component: scaleFactorGrids.component, version: scaleFactorGrids.version })
    .from(scaleFactorGrids)
    .where(eq(scaleFactorGrids.id, id))
  const cause: RecomputationCause = {
    kind: 'scale-factor-grid',
    action: done,
    component: row!.component,
    version: row!.version,
  }
  return { scenario: null, cause }
}
