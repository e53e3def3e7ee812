import { asc, eq, or } from 'drizzle-orm'
import { adaptationMeasures, adaptationPathways, decisionRecords } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import type { DecisionRecord } from './store'

// What an edit or a deletion of a measure or pathway must respect. Decision records are immutable
// and name their measures and pathway by id: what they rest on is never deleted, and never changed
// in a way that would alter what they say was decided.

type Executor = Pick<Database, 'select'>

const conflict = (message: string) => createError({ statusCode: 409, message })

/** The site's measure, locked for the change (the caller's site was checked before): another site's is 404. */
export async function lockMeasure(tx: Executor, siteId: string, measureId: string) {
  const [row] = await tx.select().from(adaptationMeasures).where(eq(adaptationMeasures.id, measureId)).for('update')
  if (!row || row.siteId !== siteId) throw createError({ statusCode: 404, message: 'No such measure.' })
  return row
}

/** The site's pathway, locked for the change (the caller's site was checked before): another site's is 404. */
export async function lockPathway(tx: Executor, siteId: string, pathwayId: string) {
  const [row] = await tx.select().from(adaptationPathways).where(eq(adaptationPathways.id, pathwayId)).for('update')
  if (!row || row.siteId !== siteId) throw createError({ statusCode: 404, message: 'No such pathway.' })
  return row
}

export async function recordsNamingMeasure(tx: Executor, measureId: string) {
  return tx.select().from(decisionRecords)
    .where(or(eq(decisionRecords.measureId, measureId), eq(decisionRecords.fromMeasureId, measureId)))
    .orderBy(asc(decisionRecords.decidedAt))
}

export async function recordsOfPathway(tx: Executor, pathwayId: string) {
  return tx.select().from(decisionRecords).where(eq(decisionRecords.pathwayId, pathwayId))
    .orderBy(asc(decisionRecords.decidedAt))
}

const recorded = (records: DecisionRecord[]) => {
  const first = records[0]!
  const count = records.length === 1 ? 'a decision record' : `${records.length} decision records`
  return `${count} (the first under ${first.scenario}, recorded ${first.decidedAt.toISOString().slice(0, 10)} by ${first.decidedByName})`
}

/** A measure that records name keeps its height, kind and lead time: the numbers they were decided on. */
export function refuseChangingRecordedMeasure(
  measure: { name: string, height: number | null, kind: string, leadTimeYears: number },
  input: { height: number | null, kind: string, leadTimeYears: number },
  records: DecisionRecord[],
) {
  if (!records.length) return
  const changed = measure.height !== input.height || measure.kind !== input.kind
    || measure.leadTimeYears !== input.leadTimeYears
  if (!changed) return
  throw conflict(
    `"${measure.name}" is named by ${recorded(records)}, which keep the height, kind and lead time they were decided on. `
    + 'Add a new measure with the new values and use it in the pathway instead; here you can change only the name, design life and cost band.',
  )
}

export function refuseDeletingRecordedMeasure(measure: { name: string }, records: DecisionRecord[]) {
  if (!records.length) return
  throw conflict(
    `"${measure.name}" is named by ${recorded(records)}; decision records are never changed or deleted, so the measure they rest on stays. `
    + 'Remove it from the pathways that list it instead.',
  )
}

/** A pathway listing the measure: named, so the planner knows where to take it out. */
export function refuseDeletingMeasureInPathway(
  measure: { id: string, name: string },
  pathways: Array<{ name: string, measureIds: string[] }>,
) {
  const using = pathways.find(p => p.measureIds.includes(measure.id))
  if (!using) return
  throw conflict(
    `"${measure.name}" is step ${using.measureIds.indexOf(measure.id) + 1} of the pathway "${using.name}"; remove it from that pathway (or delete the pathway) first.`,
  )
}

export function refuseDeletingRecordedPathway(pathway: { name: string }, records: DecisionRecord[]) {
  if (!records.length) return
  throw conflict(
    `The pathway "${pathway.name}" is named by ${recorded(records)}; decision records are never changed or deleted, so the pathway stays. `
    + 'Rename it if it is no longer followed.',
  )
}

/** An edited pathway keeps every measure and tolerance its records were decided on. */
export function refuseDroppingRecordedSteps(
  pathway: { name: string },
  input: { measureIds: string[], tolerances: number[] },
  records: DecisionRecord[],
  names: Record<string, string>,
) {
  for (const record of records) {
    const dropped = [record.fromMeasureId, record.measureId].find(id => !input.measureIds.includes(id))
    if (dropped) {
      throw conflict(
        `"${names[dropped] ?? dropped}" is part of a decision recorded on this pathway (${record.scenario}, ${record.decidedAt.toISOString().slice(0, 10)}); keep it in the pathway, or start a new pathway for the new sequence.`,
      )
    }
    if (!input.tolerances.includes(record.tolerance)) {
      throw conflict(
        `A decision on "${pathway.name}" was recorded at a tolerance of ${Math.round(record.tolerance * 100)} % (${record.scenario}, ${record.decidedAt.toISOString().slice(0, 10)}); keep that tolerance so its alerts can still be checked.`,
      )
    }
  }
}
