import { eq } from 'drizzle-orm'
import { adaptationPathways } from '~~/server/db/schema'
import type { PathwayInput } from '#shared/pathways/schemas'
import type { CurrentUser } from '../../utils/auth'
import { loadSite } from '../sites'
import { refuse } from './refuse'
import { lockPathway, recordsOfPathway, refuseDeletingRecordedPathway, refuseDroppingRecordedSteps } from './references'
import { siteMeasures } from './store'

/** Every step must be a measure of the site (the schema has already refused repeats, i.e. cycles). */
async function checkSteps(siteId: string, input: PathwayInput) {
  const measures = await siteMeasures(siteId)
  const known = new Set(measures.map(m => m.id))
  input.measureIds.forEach((id, i) => {
    if (!known.has(id))
      refuse(`measureIds.${i}`, 'This is not a measure of this site; add it to the site\'s measures first.')
  })
  return Object.fromEntries(measures.map(m => [m.id, m.name]))
}

export async function createPathway(planner: CurrentUser, siteId: string, input: PathwayInput) {
  await loadSite(planner, siteId)
  await checkSteps(siteId, input)
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(adaptationPathways)
      .values({
        siteId,
        name: input.name,
        measureIds: input.measureIds,
        tolerances: input.tolerances,
        createdBy: planner.id,
      })
      .returning()
    await writeAudit(
      tx,
      planner,
      'pathway.created',
      { type: 'site', id: siteId },
      { pathway: row!.id, name: input.name, measureIds: input.measureIds },
    )
    return row!
  })
}

/** The sequence is checked again as on creation; a pathway with decision records keeps what they were decided on. */
export async function updatePathway(planner: CurrentUser, siteId: string, pathwayId: string, input: PathwayInput) {
  await loadSite(planner, siteId)
  const names = await checkSteps(siteId, input)
  const db = await useDb()
  return db.transaction(async (tx) => {
    const before = await lockPathway(tx, siteId, pathwayId)
    refuseDroppingRecordedSteps(before, input, await recordsOfPathway(tx, pathwayId), names)
    const [row] = await tx.update(adaptationPathways)
      .set({ name: input.name, measureIds: input.measureIds, tolerances: input.tolerances })
      .where(eq(adaptationPathways.id, pathwayId)).returning()
    await writeAudit(tx, planner, 'pathway.updated', { type: 'site', id: siteId }, {
      pathway: pathwayId,
      before: { name: before.name, measureIds: before.measureIds, tolerances: before.tolerances },
      after: { name: input.name, measureIds: input.measureIds, tolerances: input.tolerances },
    })
    return row!
  })
}

/** A pathway that decision records name stays: they show what was decided on it. */
export async function deletePathway(planner: CurrentUser, siteId: string, pathwayId: string) {
  await loadSite(planner, siteId)
  const db = await useDb()
  await db.transaction(async (tx) => {
    const pathway = await lockPathway(tx, siteId, pathwayId)
    refuseDeletingRecordedPathway(pathway, await recordsOfPathway(tx, pathwayId))
    await tx.delete(adaptationPathways).where(eq(adaptationPathways.id, pathwayId))
    await writeAudit(tx, planner, 'pathway.deleted', { type: 'site', id: siteId }, {
      pathway: pathwayId, name: pathway.name, measureIds: pathway.measureIds,
    })
  })
  return { deleted: pathwayId }
}
