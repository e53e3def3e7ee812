import { and, asc, count, eq, inArray, isNotNull, lte, ne, not, notExists, sql } from 'drizzle-orm'
import {
  adaptationMeasures,
  briefings,
  correlationSets,
  decisionAlerts,
  decisionRecords,
  outlooks,
  releases,
  scaleFactorGrids,
  series,
  sites,
  storylines,
} from '~~/server/db/schema'
import type { AttentionItem } from '#shared/types/attention'
import type { CurrentUser } from '../utils/auth'

// What is waiting for someone when they open Brinkwater, read from what is stored (no outlook is
// computed here): decisions that new science has moved, decision reviews coming due, issued briefings
// newer outlooks have overtaken, sites with no outlook under their planning scenario, and, for
// analysts, colleagues' records awaiting review.

/** A decision's review shows this many days before its review date. */
export const REVIEW_NOTICE_DAYS = 60

const dayOf = (date: Date) => date.toISOString().slice(0, 10)

/** Decision records no later record reviews: the decisions in force. */
function inForce() {
  const later = sql`later`
  return notExists(
    sql`(select 1 from ${decisionRecords} as ${later} where ${later}.reviews_record_id = ${decisionRecords.id})`,
  )
}

async function decisionAlertItems(organisationId: string): Promise<AttentionItem[]> {
  const db = await useDb()
  const rows = await db
    .select({ siteId: sites.id, siteName: sites.name, alerts: count() })
    .from(decisionAlerts)
    .innerJoin(decisionRecords, eq(decisionRecords.id, decisionAlerts.recordId))
    .innerJoin(sites, eq(sites.id, decisionAlerts.siteId))
    .where(and(eq(sites.organisationId, organisationId), inForce()))
    .groupBy(sites.id, sites.name)
    .orderBy(asc(sites.name))
  return rows.map(row => ({ kind: 'decision-alert', ...row }))
}

async function decisionReviewItems(organisationId: string, now: Date): Promise<AttentionItem[]> {
  const db = await useDb()
  const today = dayOf(now)
  const noticeEnd = dayOf(new Date(now.getTime() + REVIEW_NOTICE_DAYS * 86_400_000))
  const rows = await db
    .select({
      siteId: sites.id,
      siteName: sites.name,
      measureName: adaptationMeasures.name,
      reviewDate: decisionRecords.reviewDate,
    })
    .from(decisionRecords)
    .innerJoin(sites, eq(sites.id, decisionRecords.siteId))
    .innerJoin(adaptationMeasures, eq(adaptationMeasures.id, decisionRecords.measureId))
    .where(and(eq(sites.organisationId, organisationId), lte(decisionRecords.reviewDate, noticeEnd), inForce()))
    .orderBy(asc(decisionRecords.reviewDate), asc(sites.name))
  return rows.map(row => ({ kind: 'decision-review', ...row, overdue: row.reviewDate < today }))
}

async function staleBriefingItems(organisationId: string): Promise<AttentionItem[]> {
  const db = await useDb()
  const newer = sql`newer`
  // A briefing with an issued newer version has been renewed: only the latest issued one is listed.
  const renewed = sql`exists (select 1 from ${briefings} as ${newer}
    where ${newer}.previous_id = ${briefings.id} and ${newer}.state = 'issued')`
  const rows = await db
    .select({ briefingId: briefings.id, title: briefings.title, siteName: sites.name, staleness: briefings.staleness })
    .from(briefings)
    .innerJoin(sites, eq(sites.id, briefings.siteId))
    .where(and(
      eq(briefings.organisationId, organisationId),
      eq(briefings.state, 'issued'),
      isNotNull(briefings.staleness),
      not(renewed),
    ))
    .orderBy(asc(sites.name), asc(briefings.title))
  return rows.flatMap(({ staleness, ...row }) => staleness?.changes.length
    ? [{ kind: 'stale-briefing' as const, ...row, changes: staleness.changes.length }]
    : [])
}

async function noPlanningOutlookItems(organisationId: string): Promise<AttentionItem[]> {
  const db = await useDb()
  // A running outlook will answer soon; only a site with neither a finished nor a running one is listed.
  const planned = db
    .select({ id: outlooks.id })
    .from(outlooks)
    .where(and(
      eq(outlooks.siteId, sites.id),
      eq(outlooks.scenario, sites.planningScenario),
      inArray(outlooks.state, ['done', 'running']),
    ))
  const rows = await db
    .select({ siteId: sites.id, siteName: sites.name, scenario: sites.planningScenario })
    .from(sites)
    .where(and(eq(sites.organisationId, organisationId), notExists(planned)))
    .orderBy(asc(sites.name))
  return rows.map(row => ({ kind: 'no-planning-outlook', ...row }))
}

/** In review, in the analyst's organisation, and neither written nor changed by them (so theirs to judge). */
function reviewableBy<T extends typeof correlationSets | typeof scaleFactorGrids | typeof storylines | typeof releases>(
  table: T,
  user: CurrentUser,
) {
  return and(
    eq(table.organisationId, user.organisationId),
    eq(table.state, 'in-review'),
    ne(table.authorId, user.id),
    not(sql`${user.id}::uuid = any(${table.coauthorIds})`),
  )
}

async function awaitingReviewItems(user: CurrentUser): Promise<AttentionItem[]> {
  const db = await useDb()
  const [releaseRows, correlationRows, gridRows, storylineRows] = await Promise.all([
    db
      .select({ id: releases.id, title: series.title, version: releases.version })
      .from(releases)
      .innerJoin(series, eq(series.id, releases.seriesId))
      .where(reviewableBy(releases, user)),
    db
      .select({ id: correlationSets.id, title: correlationSets.title, version: correlationSets.version })
      .from(correlationSets)
      .where(reviewableBy(correlationSets, user)),
    db
      .select({ id: scaleFactorGrids.id, title: scaleFactorGrids.title, version: scaleFactorGrids.version })
      .from(scaleFactorGrids)
      .where(reviewableBy(scaleFactorGrids, user)),
    db
      .select({ id: storylines.id, title: storylines.name, version: storylines.version })
      .from(storylines)
      .where(reviewableBy(storylines, user)),
  ])
  return [
    ...releaseRows.map(row => ({ kind: 'awaiting-review' as const, recordKind: 'release' as const, ...row })),
    ...correlationRows.map(row => ({ kind: 'awaiting-review' as const, recordKind: 'correlation-set' as const, ...row })),
    ...gridRows.map(row => ({ kind: 'awaiting-review' as const, recordKind: 'scale-factor-grid' as const, ...row })),
    ...storylineRows.map(row => ({ kind: 'awaiting-review' as const, recordKind: 'storyline' as const, ...row })),
  ]
}

/**
 * Everything waiting for this person, most pressing first: decisions moved by new science, then
 * reviews overdue or due soon, briefings out of date, then sites without a planning outlook; analysts see
 * records to review.
 * Anyone in an organisation sees its items (a reader is told too, though a planner acts on them).
 */
export async function attentionFor(user: CurrentUser, now = new Date()): Promise<AttentionItem[]> {
  if (user.role === 'analyst') return awaitingReviewItems(user)
  if (user.role === 'operator') return []
  const [alerts, reviews, stale, missing] = await Promise.all([
    decisionAlertItems(user.organisationId),
    decisionReviewItems(user.organisationId, now),
    staleBriefingItems(user.organisationId),
    noPlanningOutlookItems(user.organisationId),
  ])
  return [...alerts, ...reviews, ...stale, ...missing]
}
