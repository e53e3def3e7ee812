import { asc, eq, inArray } from 'drizzle-orm'
import { annualMaxima, sites, thresholds } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import type { SiteInput } from '#shared/schemas/sites'
import type { CurrentUser } from '../utils/auth'

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0]

/** A site with its thresholds in order, whoever owns it (for background work), or null. */
export async function siteWithThresholds(id: string) {
  const db = await useDb()
  const [site] = await db.select().from(sites).where(eq(sites.id, id))
  if (!site) return null
  const rows = await db.select().from(thresholds).where(eq(thresholds.siteId, id)).orderBy(asc(thresholds.position))
  return { ...site, thresholds: rows }
}

/** A site of the caller's organisation, or 404 (another organisation's site looks missing). */
export async function loadSite(user: CurrentUser, id: string) {
  const site = await siteWithThresholds(id)
  if (!site || site.organisationId !== user.organisationId) throw createError({ statusCode: 404, message: 'No such site.' })
  return site
}

function siteColumns(input: SiteInput) {
  return {
    name: input.name,
    latitude: input.latitude,
    longitude: input.longitude,
    referenceLevel: input.referenceLevel,
    landMotionRate: input.landMotion.rateMmPerYear,
    landMotionSigma: input.landMotion.sigmaMmPerYear,
    landMotionSource: input.landMotion.source,
    landMotionReference: input.landMotion.reference,
    landMotionEpoch: input.landMotion.epoch,
    ...(input.gumbel !== undefined
      ? { gumbelLocation: input.gumbel?.location ?? null, gumbelScale: input.gumbel?.scale ?? null, gumbelSource: input.gumbel ? 'entered' : null }
      : {}),
  }
}

/**
 * Thresholds are updated in place by position, so a threshold keeps its id (and its history in
 * outlooks, briefings and e-mails) when its label or height is edited.
 */
async function replaceThresholds(tx: Tx, siteId: string, list: SiteInput['thresholds']) {
  const existing = await tx.select({ id: thresholds.id }).from(thresholds).where(eq(thresholds.siteId, siteId)).orderBy(asc(thresholds.position))
  for (const [position, t] of list.entries()) {
    const values = { label: t.label, height: t.height, designLifeYears: t.designLifeYears ?? null, position }
    const current = existing[position]
    if (current) await tx.update(thresholds).set(values).where(eq(thresholds.id, current.id))
    else await tx.insert(thresholds).values({ ...values, siteId })
  }
  const extra = existing.slice(list.length).map(t => t.id)
  if (extra.length) await tx.delete(thresholds).where(inArray(thresholds.id, extra))
}

export async function createSite(planner: CurrentUser, input: SiteInput) {
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [site] = await tx.insert(sites).values({ ...siteColumns(input), organisationId: planner.organisationId, createdBy: planner.id }).returning()
    await replaceThresholds(tx, site!.id, input.thresholds)
    await writeAudit(tx, planner, 'site.created', { type: 'site', id: site!.id }, { name: input.name })
    return site!
  })
}

export async function updateSite(planner: CurrentUser, id: string, input: SiteInput, expectedVersion?: string) {
  const before = await loadSite(planner, id)
  const db = await useDb()
  const updated = await db.transaction(async (tx) => {
    // The row lock makes check-then-write one step: of two saves from the same version, one wins.
    const [current] = await tx.select({ updatedAt: sites.updatedAt }).from(sites).where(eq(sites.id, id)).for('update')
    if (expectedVersion && current!.updatedAt.toISOString() !== new Date(expectedVersion).toISOString()) {
      throw createError({ statusCode: 412, message: 'Someone saved changes to this site after you opened it. Reload the page to see them, then make your changes again.' })
    }
    const [site] = await tx.update(sites).set({ ...siteColumns(input), updatedAt: new Date() }).where(eq(sites.id, id)).returning()
    await replaceThresholds(tx, id, input.thresholds)
    await writeAudit(tx, planner, 'site.updated', { type: 'site', id }, {
      landMotion: { before: [before.landMotionRate, before.landMotionSigma], after: [input.landMotion.rateMmPerYear, input.landMotion.sigmaMmPerYear] },
      thresholds: { before: before.thresholds.map(t => [t.label, t.height]), after: input.thresholds.map(t => [t.label, t.height]) },
    })
    // Its outlooks are recomputed and its watchers told, in the background (server/services/background.ts).
    await enqueueJob(tx, 'recompute-site', { siteId: id, cause: { en: `The land motion or thresholds of ${input.name} were updated.`, es: `Se actualizaron el movimiento del terreno o los umbrales de ${input.name}.` } })
    return site!
  })
  kickJobs()
  return updated
}

export async function replaceAnnualMaxima(planner: CurrentUser, id: string, fit: { maxima: { year: number, value: number }[], gumbel: { location: number, scale: number }, sampleSize: number }) {
  await loadSite(planner, id)
  const db = await useDb()
  await db.transaction(async (tx) => {
    await tx.delete(annualMaxima).where(eq(annualMaxima.siteId, id))
    await tx.insert(annualMaxima).values(fit.maxima.map(m => ({ siteId: id, ...m })))
    await tx.update(sites).set({
      gumbelLocation: fit.gumbel.location, gumbelScale: fit.gumbel.scale, gumbelSource: `fitted:${fit.sampleSize}`, updatedAt: new Date(),
    }).where(eq(sites.id, id))
    await writeAudit(tx, planner, 'site.annual-maxima', { type: 'site', id }, { years: fit.sampleSize, ...fit.gumbel })
  })
}
