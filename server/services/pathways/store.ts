import { and, asc, desc, eq, inArray } from 'drizzle-orm'
import { adaptationMeasures, adaptationPathways, decisionAlerts, decisionRecords } from '~~/server/db/schema'

// Reads of a site's measures, pathways, records and alerts. Callers have checked the site is the caller's.

export type Measure = typeof adaptationMeasures.$inferSelect
export type Pathway = typeof adaptationPathways.$inferSelect
export type DecisionRecord = typeof decisionRecords.$inferSelect
export type DecisionAlert = typeof decisionAlerts.$inferSelect

export async function siteMeasures(siteId: string) {
  const db = await useDb()
  return db
    .select()
    .from(adaptationMeasures)
    .where(eq(adaptationMeasures.siteId, siteId))
    .orderBy(asc(adaptationMeasures.createdAt), asc(adaptationMeasures.id))
}

export async function sitePathways(siteId: string) {
  const db = await useDb()
  return db
    .select()
    .from(adaptationPathways)
    .where(eq(adaptationPathways.siteId, siteId))
    .orderBy(asc(adaptationPathways.createdAt), asc(adaptationPathways.id))
}

export async function siteRecords(siteId: string) {
  const db = await useDb()
  return db
    .select()
    .from(decisionRecords)
    .where(eq(decisionRecords.siteId, siteId))
    .orderBy(desc(decisionRecords.decidedAt), desc(decisionRecords.id))
}

/** Records not yet reviewed by a later one: the decisions in force. */
export function currentRecords(records: DecisionRecord[]) {
  const reviewed = new Set(records.flatMap(r => r.reviewsRecordId ? [r.reviewsRecordId] : []))
  return records.filter(r => !reviewed.has(r.id))
}

/** Alerts whose record has not been reviewed since: the site page flags them. */
export async function openAlerts(siteId: string, records: DecisionRecord[]) {
  const db = await useDb()
  const current = currentRecords(records).map(r => r.id)
  if (!current.length) return []
  return db
    .select()
    .from(decisionAlerts)
    .where(and(eq(decisionAlerts.siteId, siteId), inArray(decisionAlerts.recordId, current)))
    .orderBy(desc(decisionAlerts.createdAt))
}

/** How many decision alerts the site page flags. */
export async function openAlertCount(siteId: string) {
  return (await openAlerts(siteId, await siteRecords(siteId))).length
}
