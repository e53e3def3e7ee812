import { eq } from 'drizzle-orm'
import { decisionRecords, users } from '~~/server/db/schema'
import { ENGINE_VERSION } from '#shared/engine/version'
import { decisionYear } from '#shared/pathways/decisions'
import type { DecisionRecordInput } from '#shared/pathways/schemas'
import type { CurrentUser } from '../../utils/auth'
import { latestOutlooks } from '../notify'
import { loadSite } from '../sites'
import { ensureTipping } from './evaluation'
import { refuse } from './refuse'
import { siteMeasures, sitePathways, siteRecords } from './store'
import { currentYear } from './view'

/**
 * Records what a council decided, with the numbers of the outlook it rests on at this moment: the
 * tipping year of the measure in service (the adopted value), the decision year, the outlook's input
 * hash and release versions. A record is never changed; a review is a new record naming the old one.
 */
export async function createRecord(planner: CurrentUser, siteId: string, input: DecisionRecordInput) {
  await loadSite(planner, siteId)
  const [measures, pathways, records] = await Promise.all([
    siteMeasures(siteId),
    sitePathways(siteId),
    siteRecords(siteId),
  ])
  const pathway = pathways.find(p => p.id === input.pathwayId) ?? refuse('pathwayId', 'Choose a pathway of this site.')
  const step = pathway.measureIds.indexOf(input.measureId)
  if (step < 0) refuse('measureId', 'Choose a measure of this pathway.')
  if (step === 0)
    refuse('measureId', 'The first measure of a pathway is the one in service; choose a measure that follows it.')
  if (!pathway.tolerances.includes(input.tolerance)) {
    refuse(
      'tolerance',
      `Choose one of this pathway's tolerances: ${pathway.tolerances.map(t => `${Math.round(t * 100)} %`).join(', ')}.`,
    )
  }
  const today = new Date().toISOString().slice(0, 10)
  if (input.reviewDate <= today) refuse('reviewDate', `Choose a review date after today (${today}).`)
  if (input.reviewsRecordId && !records.some(r => r.id === input.reviewsRecordId))
    refuse('reviewsRecordId', 'Choose a decision record of this site to review.')
  const outlook
    = (await latestOutlooks(siteId)).find(o => o.scenario === input.scenario)
      ?? refuse(
        'scenario',
        `This site has no finished outlook under ${input.scenario}; compute one first, then record the decision.`,
      )
  const from = measures.find(m => m.id === pathway.measureIds[step - 1])!
  const to = measures.find(m => m.id === input.measureId)!
  const evaluated
    = (await ensureTipping(outlook, measures, pathway.tolerances))
      ?? refuse(
        'scenario',
        `The ${input.scenario} outlook of this site cannot be evaluated by this version of the engine; compute it again on the site page, then record the decision.`,
      )
  const tippingYear = evaluated.tipping[from.id]?.find(t => t.tolerance === input.tolerance)?.year ?? null
  const db = await useDb()
  const [person] = await db.select({ name: users.name }).from(users).where(eq(users.id, planner.id))
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(decisionRecords)
      .values({
        siteId,
        pathwayId: pathway.id,
        measureId: to.id,
        fromMeasureId: from.id,
        scenario: input.scenario,
        tolerance: input.tolerance,
        tippingYear,
        decisionYear: decisionYear(tippingYear, to.leadTimeYears, currentYear()).decisionYear,
        horizon: evaluated.horizon,
        leadTimeYears: to.leadTimeYears,
        marginYears: input.marginYears,
        rationale: input.rationale,
        outlookId: outlook.id,
        outlookInputHash: outlook.inputHash,
        engineVersion: ENGINE_VERSION,
        releases: evaluated.releaseRefs.map(r => ({
          component: r.component,
          releaseId: r.releaseId,
          seriesId: r.seriesId,
          version: r.version,
          citation: r.citation,
        })),
        decidedBy: planner.id,
        decidedByName: person?.name ?? planner.email,
        reviewDate: input.reviewDate,
        reviewsRecordId: input.reviewsRecordId,
      })
      .returning()
    await writeAudit(
      tx,
      planner,
      input.reviewsRecordId ? 'decision.reviewed' : 'decision.recorded',
      { type: 'site', id: siteId },
      { record: row!.id, measure: to.name, scenario: input.scenario, tolerance: input.tolerance, tippingYear },
    )
    return row!
  })
}
