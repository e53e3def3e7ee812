import { asc, eq, inArray } from 'drizzle-orm'
import { annualMaxima, sites, thresholds } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import { GUMBEL_BOUNDS, type SiteInput } from '#shared/schemas/sites'
import { fitAnnualMaximaCsv } from '#shared/releases/annual-maxima'
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
  if (!site || site.organisationId !== user.organisationId)
    throw createError({ statusCode: 404, message: 'No such site.' })
  return site
}

function siteColumns(input: SiteInput) {
  return {
    name: input.name,
    latitude: input.latitude,
    longitude: input.longitude,
    referenceLevel: input.referenceLevel,
    datumKind: input.datum.kind,
    datumOffset: input.datum.offset,
    referenceEpoch: input.referenceEpoch,
    landMotionRate: input.landMotion.rateMmPerYear,
    landMotionSigma: input.landMotion.sigmaMmPerYear,
    landMotionSource: input.landMotion.source,
    landMotionReference: input.landMotion.reference,
    landMotionEpoch: input.landMotion.epoch,
    ...(input.planning
      ? { planningScenario: input.planning.scenario, planningTolerance: input.planning.tolerance }
      : {}),
    ...(input.gumbel !== undefined
      ? {
          gumbelLocation: input.gumbel?.location ?? null,
          gumbelScale: input.gumbel?.scale ?? null,
          gumbelSource: input.gumbel ? 'entered' : null,
          gumbelTrend: null,
          gumbelLocationSe: null,
          gumbelScaleSe: null,
          gumbelTrendSe: null,
        }
      : {}),
  }
}

/**
 * Thresholds are updated in place by position, so a threshold keeps its id (and its history in
 * outlooks, briefings and e-mails) when its label or height is edited.
 */
async function replaceThresholds(tx: Tx, siteId: string, list: SiteInput['thresholds']) {
  const existing = await tx
    .select({ id: thresholds.id })
    .from(thresholds)
    .where(eq(thresholds.siteId, siteId))
    .orderBy(asc(thresholds.position))
  for (const [position, t] of list.entries()) {
    const values = {
      label: t.label,
      height: t.height,
      kind: t.kind,
      buildYear: t.buildYear ?? null,
      designLifeYears: t.designLifeYears ?? null,
      position,
    }
    const current = existing[position]
    if (current) await tx.update(thresholds).set(values).where(eq(thresholds.id, current.id))
    else await tx.insert(thresholds).values({ ...values, siteId })
  }
  const extra = existing.slice(list.length).map(t => t.id)
  if (extra.length) await tx.delete(thresholds).where(inArray(thresholds.id, extra))
}

/**
 * A flood level is compared with the total water level, so the site must keep extreme-water
 * statistics. The body may leave them out (they stay as stored), so this is checked against both.
 */
function requireStatisticsForFloodLevels(input: SiteInput, stored: { gumbelLocation: number | null } | null) {
  const hasStatistics = input.gumbel !== undefined ? input.gumbel !== null : stored?.gumbelLocation != null
  if (hasStatistics) return
  const issues = input.thresholds.flatMap((t, i) =>
    t.kind === 'flood-level'
      ? [
          {
            field: `thresholds.${i}.kind`,
            message:
              'A flood level is compared with the total water level and needs the site\'s extreme-water statistics; enter them or make this a mean-sea-level threshold.',
          },
        ]
      : [],
  )
  if (issues.length)
    throw createError({
      statusCode: 400,
      message: issues.map(i => `${i.field}: ${i.message}`).join(' '),
      data: { issues },
    })
}

export async function createSite(planner: CurrentUser, input: SiteInput) {
  requireStatisticsForFloodLevels(input, null)
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [site] = await tx
      .insert(sites)
      .values({ ...siteColumns(input), organisationId: planner.organisationId, createdBy: planner.id })
      .returning()
    await replaceThresholds(tx, site!.id, input.thresholds)
    await writeAudit(tx, planner, 'site.created', { type: 'site', id: site!.id }, { name: input.name })
    return site!
  })
}

export async function updateSite(planner: CurrentUser, id: string, input: SiteInput, expectedVersion?: string) {
  const before = await loadSite(planner, id)
  requireStatisticsForFloodLevels(input, before)
  const db = await useDb()
  const updated = await db.transaction(async (tx) => {
    // The row lock makes check-then-write one step: of two saves from the same version, one wins.
    const [current] = await tx.select({ updatedAt: sites.updatedAt }).from(sites).where(eq(sites.id, id)).for('update')
    if (expectedVersion && current!.updatedAt.toISOString() !== new Date(expectedVersion).toISOString()) {
      throw createError({
        statusCode: 412,
        message:
          'Someone saved changes to this site after you opened it. Reload the page to see them, then make your changes again.',
      })
    }
    const [site] = await tx
      .update(sites)
      .set({ ...siteColumns(input), updatedAt: new Date() })
      .where(eq(sites.id, id))
      .returning()
    await replaceThresholds(tx, id, input.thresholds)
    await writeAudit(
      tx,
      planner,
      'site.updated',
      { type: 'site', id },
      {
        landMotion: {
          before: [before.landMotionRate, before.landMotionSigma],
          after: [input.landMotion.rateMmPerYear, input.landMotion.sigmaMmPerYear],
        },
        thresholds: {
          before: before.thresholds.map(t => [t.label, t.height]),
          after: input.thresholds.map(t => [t.label, t.height]),
        },
      },
    )
    // Its outlooks are recomputed and its watchers told, in the background (server/services/background.ts).
    await enqueueJob(tx, 'recompute-site', { siteId: id, cause: { kind: 'site-edited', site: input.name } })
    return site!
  })
  kickJobs()
  return updated
}

/**
 * Annual maxima (CSV year,value, metres above the datum) fitted with a location that moves in time,
 * stored on the site with the fit's location at the reference epoch, trend and standard errors. The
 * site's outlooks are recomputed and its watchers told, as for any edit.
 */
export async function replaceAnnualMaxima(planner: CurrentUser, id: string, csv: string) {
  const site = await loadSite(planner, id)
  const { maxima, fit, sampleSize } = asBadRequest(() => fitAnnualMaximaCsv(csv, site.referenceEpoch))
  // A site never stores statistics the form would refuse.
  const { location, scale } = GUMBEL_BOUNDS
  if (fit.location < location.min || fit.location > location.max || fit.scale > scale.max) {
    const message = `The fitted Gumbel location ${fit.location.toFixed(2)} m and scale ${fit.scale.toFixed(2)} m are outside what a site accepts (location ${location.min} to ${location.max} m, scale up to ${scale.max} m above the datum); check the values are metres above this site's datum.`
    throw createError({ statusCode: 400, message: `csv: ${message}`, data: { issues: [{ field: 'csv', message }] } })
  }
  const db = await useDb()
  await db.transaction(async (tx) => {
    await tx.delete(annualMaxima).where(eq(annualMaxima.siteId, id))
    await tx.insert(annualMaxima).values(maxima.map(m => ({ siteId: id, ...m })))
    await tx
      .update(sites)
      .set({
        gumbelLocation: fit.location,
        gumbelScale: fit.scale,
        gumbelSource: `fitted:${sampleSize}`,
        gumbelTrend: fit.trendPerYear,
        gumbelLocationSe: fit.se.location,
        gumbelScaleSe: fit.se.scale,
        gumbelTrendSe: fit.se.trendPerYear,
        updatedAt: new Date(),
      })
      .where(eq(sites.id, id))
    await writeAudit(
      tx,
      planner,
      'site.annual-maxima',
      { type: 'site', id },
      { years: sampleSize, location: fit.location, scale: fit.scale, trendPerYear: fit.trendPerYear },
    )
    await enqueueJob(tx, 'recompute-site', { siteId: id, cause: { kind: 'annual-maxima', site: site.name } })
  })
  kickJobs()
  return { fit, sampleSize, referenceEpoch: site.referenceEpoch }
}
