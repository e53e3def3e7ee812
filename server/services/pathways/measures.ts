import { eq } from 'drizzle-orm'
import { adaptationMeasures, adaptationPathways } from '~~/server/db/schema'
import type { MeasureInput } from '#shared/pathways/schemas'
import { MAX_MEASURES } from '#shared/pathways/schemas'
import type { CurrentUser } from '../../utils/auth'
import { loadSite } from '../sites'
import { refuse } from './refuse'
import {
  lockMeasure,
  recordsNamingMeasure,
  refuseChangingRecordedMeasure,
  refuseDeletingMeasureInPathway,
  refuseDeletingRecordedMeasure,
} from './references'
import { siteMeasures } from './store'
import { queueTippingEvaluations } from './evaluation'

type Site = Awaited<ReturnType<typeof loadSite>>

/**
 * A measure must protect to a height above today's level: for a mean-sea-level height the mean sea
 * level at the reference epoch (the datum offset); for a flood level the usual yearly highest water
 * (the Gumbel location), which it would meet most years already.
 */
function checkAboveTodaysLevel(site: Site, input: MeasureInput) {
  if (input.height === null) return
  const m = (value: number) => `${value.toFixed(2)} m`
  if (input.kind === 'mean-sea-level' && input.height <= site.datumOffset) {
    refuse(
      'height',
      `${m(input.height)} is at or below mean sea level at the reference epoch ${site.referenceEpoch} (${m(site.datumOffset)} above ${site.referenceLevel}); enter the height the measure protects to, above that level.`,
    )
  }
  if (input.kind === 'flood-level') {
    if (site.gumbelLocation === null || site.gumbelScale === null) {
      refuse(
        'kind',
        'A flood level is compared with the total water level and needs the site\'s extreme-water statistics; enter them on the site or make this a mean-sea-level height.',
      )
    }
    if (input.height <= site.gumbelLocation) {
      refuse(
        'height',
        `${m(input.height)} is at or below the usual yearly highest water here (${m(site.gumbelLocation)} above ${site.referenceLevel}), which reaches it most years already; enter the crest or floor height the measure protects to.`,
      )
    }
  }
}

export async function createMeasure(planner: CurrentUser, siteId: string, input: MeasureInput) {
  const site = await loadSite(planner, siteId)
  checkAboveTodaysLevel(site, input)
  if ((await siteMeasures(siteId)).length >= MAX_MEASURES)
    refuse('name', `A site has at most ${MAX_MEASURES} measures.`)
  const db = await useDb()
  const created = await db.transaction(async (tx) => {
    const [row] = await tx.insert(adaptationMeasures).values({
      siteId, name: input.name, height: input.height, kind: input.kind, leadTimeYears: input.leadTimeYears,
      designLifeYears: input.designLifeYears, costBand: input.costBand, createdBy: planner.id,
    }).returning()
    await writeAudit(
      tx,
      planner,
      'measure.created',
      { type: 'site', id: siteId },
      { measure: row!.id, name: input.name, height: input.height, leadTimeYears: input.leadTimeYears },
    )
    await queueTippingEvaluations(tx, siteId)
    return row!
  })
  kickJobs()
  return created
}

/** A new height, kind or lead time moves the pathways' tipping years at once; what records rest on cannot change. */
export async function updateMeasure(planner: CurrentUser, siteId: string, measureId: string, input: MeasureInput) {
  const site = await loadSite(planner, siteId)
  checkAboveTodaysLevel(site, input)
  const db = await useDb()
  return db.transaction(async (tx) => {
    const before = await lockMeasure(tx, siteId, measureId)
    refuseChangingRecordedMeasure(before, input, await recordsNamingMeasure(tx, measureId))
    const [row] = await tx.update(adaptationMeasures).set({
      name: input.name, height: input.height, kind: input.kind, leadTimeYears: input.leadTimeYears,
      designLifeYears: input.designLifeYears, costBand: input.costBand,
    }).where(eq(adaptationMeasures.id, measureId)).returning()
    await writeAudit(tx, planner, 'measure.updated', { type: 'site', id: siteId }, {
      measure: measureId,
      before: { name: before.name, height: before.height, kind: before.kind, leadTimeYears: before.leadTimeYears },
      after: { name: input.name, height: input.height, kind: input.kind, leadTimeYears: input.leadTimeYears },
    })
    return row!
  })
}

/** Only a measure that no pathway lists and no decision record names can go. */
export async function deleteMeasure(planner: CurrentUser, siteId: string, measureId: string) {
  await loadSite(planner, siteId)
  const db = await useDb()
  await db.transaction(async (tx) => {
    const measure = await lockMeasure(tx, siteId, measureId)
    refuseDeletingRecordedMeasure(measure, await recordsNamingMeasure(tx, measureId))
    const pathways = await tx.select().from(adaptationPathways).where(eq(adaptationPathways.siteId, siteId))
    refuseDeletingMeasureInPathway(measure, pathways)
    await tx.delete(adaptationMeasures).where(eq(adaptationMeasures.id, measureId))
    await writeAudit(tx, planner, 'measure.deleted', { type: 'site', id: siteId }, {
      measure: measureId, name: measure.name, height: measure.height, leadTimeYears: measure.leadTimeYears,
    })
  })
  return { deleted: measureId }
}
