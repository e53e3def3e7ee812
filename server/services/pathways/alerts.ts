import { and, eq } from 'drizzle-orm'
import { decisionAlerts, sites, users, type AlertReason } from '~~/server/db/schema'
import type { OutlookReleaseRef } from '#shared/types/outlook'
import type { StoredCause } from '#shared/types/causes'
import { causeSentence } from '#shared/wording/causes'
import type { Comparison } from '../notify'
import { ensureTipping } from './evaluation'
import { decisionAlertMail, type AlertedDecision } from './alert-mail'
import { currentRecords, siteMeasures, sitePathways, siteRecords, type DecisionRecord } from './store'
import { currentYear } from './view'
import { languageOf } from '#shared/wording/translate'

// After a site's outlooks are computed again (new science, a site edit, a new record), each
// decision in force is checked against the new outlook of its scenario. It is raised when the measure
// in service now tips before today + the lead time of the next measure (its decision year has passed)
// where it did not when recorded, or when its tipping year moved by more than the record's margin.
// The planners of the organisation get one e-mail per recomputation naming every decision raised,
// opening with what made the outlooks be computed again.

function reasonFor(
  record: DecisionRecord,
  tippingYear: number | null,
  horizon: number,
  year: number,
): AlertReason['kinds'] {
  const kinds: AlertReason['kinds'] = []
  const decision = tippingYear === null ? null : tippingYear - record.leadTimeYears
  const wasLate = record.decisionYear !== null && record.decisionYear < year
  const earlier = decision !== null && (record.decisionYear === null || decision < record.decisionYear)
  if (decision !== null && decision < year && !wasLate && earlier) kinds.push('late')
  // A year beyond the horizon counts as the horizon's next year.
  const beyond = (y: number | null, h: number) => y ?? h + 1
  if (Math.abs(beyond(tippingYear, horizon) - beyond(record.tippingYear, record.horizon)) > record.marginYears)
    kinds.push('moved')
  return kinds
}

function releaseChanges(before: OutlookReleaseRef[], after: OutlookReleaseRef[]) {
  return after.flatMap((ref) => {
    const was = before.find(r => r.component === ref.component)
    return was?.releaseId === ref.releaseId
      ? []
      : [{ component: ref.component, from: was?.version ?? null, to: ref.version, citation: ref.citation }]
  })
}

export async function checkDecisionAlerts(siteId: string, cause: StoredCause, comparisons: Comparison[]) {
  if (!comparisons.length) return
  const records = currentRecords(await siteRecords(siteId))
  if (!records.length) return
  const [measures, pathways] = await Promise.all([siteMeasures(siteId), sitePathways(siteId)])
  const year = currentYear()
  const raised: Array<{ record: DecisionRecord, reason: AlertReason, outlookId: string }> = []
  for (const record of records) {
    const comparison = comparisons.find(c => c.scenario === record.scenario)
    const pathway = pathways.find(p => p.id === record.pathwayId)
    if (!comparison || !pathway) continue
    // Stored first if the outlook's tipping years are not yet: the alert rests on the numbers pages show.
    const evaluated = await ensureTipping(comparison.after, measures, pathway.tolerances)
    if (!evaluated) continue
    const tippingYear
      = evaluated.tipping[record.fromMeasureId]?.find(t => t.tolerance === record.tolerance)?.year ?? null
    const kinds = reasonFor(record, tippingYear, evaluated.horizon, year)
    if (!kinds.length) continue
    raised.push({
      record, outlookId: comparison.after.id,
      reason: {
        kinds, tippingYear, decisionYear: tippingYear === null ? null : tippingYear - record.leadTimeYears,
        releases: releaseChanges(comparison.before.releaseRefs, comparison.after.releaseRefs),
      },
    })
  }
  if (!raised.length) return
  const db = await useDb()
  const [site] = await db
    .select({ name: sites.name, organisationId: sites.organisationId })
    .from(sites)
    .where(eq(sites.id, siteId))
  if (!site) return
  const planners = await db.select({ id: users.id, email: users.email, locale: users.locale }).from(users)
    .where(and(eq(users.organisationId, site.organisationId), eq(users.role, 'planner'), eq(users.disabled, false)))
  const names = new Map(measures.map(m => [m.id, m.name]))
  const event = comparisons.map(c => c.after.id).sort().join(',')
  await db.transaction(async (tx) => {
    const inserted = await tx.insert(decisionAlerts)
      .values(raised.map(r => ({ recordId: r.record.id, siteId, outlookId: r.outlookId, reason: r.reason })))
      .onConflictDoNothing().returning({ recordId: decisionAlerts.recordId })
    if (!inserted.length) return
    const fresh = raised.filter(r => inserted.some(i => i.recordId === r.record.id))
    const decisions: AlertedDecision[] = fresh.map(({ record, reason }) => ({
      measure: names.get(record.measureId) ?? '',
      inService: names.get(record.fromMeasureId) ?? '',
      scenario: record.scenario,
      tolerance: record.tolerance,
      leadTimeYears: record.leadTimeYears,
      before: { tippingYear: record.tippingYear, decisionYear: record.decisionYear },
      after: { tippingYear: reason.tippingYear, decisionYear: reason.decisionYear },
      horizon: record.horizon,
      kinds: reason.kinds,
      marginYears: record.marginYears,
      releases: reason.releases,
    }))
    for (const planner of planners) {
      const language = languageOf(planner.locale)
      const mail = decisionAlertMail({
        language,
        cause: causeSentence(cause, language),
        site: site.name,
        url: `${appUrl()}/sites/${siteId}/pathways`,
        currentYear: year,
        decisions,
      })
      // One e-mail per planner and recomputation, even when its job runs again after a crash.
      await queueMail(tx, { to: planner.email, ...mail, dedupeKey: `decision-alert:${siteId}:${event}:${planner.id}` })
    }
  })
}
