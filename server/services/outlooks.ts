import { createHash } from 'node:crypto'
import { and, count, desc, eq, isNotNull } from 'drizzle-orm'
import { organisations, outlooks, sites, type OutlookReleaseRef } from '~~/server/db/schema'
import { validateOutlookInput } from '#shared/engine'
import { minOf } from '#shared/engine/arrays'
import { ENGINE_VERSION } from '#shared/engine/version'
import type { OutlookRequest } from '#shared/schemas/sites'
import type { OutlookNote } from '#shared/types/outlook-notes'
import type { DatumKind } from '#shared/types/science'
import type { CurrentUser } from '../utils/auth'
import { correlationFor, scaleFactorsAt, scienceFor } from './science-inputs'
import { adoptedForReading } from './adoptions'
import { awaitOutlook, kickOutlooks } from './outlook-jobs'
import { loadSite } from './sites'

type Site = Awaited<ReturnType<typeof loadSite>>

/** Rise heights the exceedance curves are drawn on, metres above mean sea level at the reference epoch. */
export const HEIGHT_GRID = { from: -1, to: 4, step: 0.02 }
const DECADE = 10

/**
 * Output years: the site's reference epoch, then each decade up to the shortest release horizon. They
 * depend on the site and the science only, never on the calendar, so the same inputs give the same
 * outlook in any year.
 */
export function outlookYears(referenceEpoch: number, horizon: number) {
  const years = [referenceEpoch]
  for (let year = Math.floor(referenceEpoch / DECADE) * DECADE + DECADE; year <= horizon; year += DECADE) years.push(year)
  return years
}

/**
 * What the page, briefing and e-mails need to state heights as the planner entered them: the engine
 * works in metres above mean sea level at the reference epoch, the planner above the datum.
 */
export interface OutlookDatum { name: string, kind: DatumKind, offset: number, referenceEpoch: number }

/**
 * A fitted site's parameter uncertainty, sampled with each trajectory. Only the standard errors are
 * stored, so location and scale are drawn as uncorrelated: a stated simplification (the two estimates
 * of a Gumbel fit correlate by about 0.3 [memory: asymptotic covariance of the Gumbel MLE]).
 */
function fitUncertainty(site: Site) {
  return site.gumbelLocationSe !== null && site.gumbelScaleSe !== null ? { locationSe: site.gumbelLocationSe, scaleSe: site.gumbelScaleSe } : {}
}

/**
 * A flood level is compared with the total water level, which needs the site's extreme-water
 * statistics. Leaving it out of the run would give an outlook that silently lacks a threshold the
 * planner asked for, so the run is refused and says what to fix.
 */
function refuseFloodLevelsWithoutStatistics(site: Site, hasStatistics: boolean) {
  if (hasStatistics) return
  const issues = site.thresholds.flatMap((t, index) => t.kind === 'flood-level'
    ? [{ field: `thresholds.${index}.kind`, message: `The flood level "${t.label}" is compared with the total water level and needs the site's extreme-water statistics (Gumbel location and scale); enter them on the site, or make it a mean-sea-level threshold.` }]
    : [])
  if (issues.length) throw createError({ statusCode: 400, message: issues.map(issue => `${issue.field}: ${issue.message}`).join(' '), data: { issues } })
}

/** Everything that goes into one run, with the provenance stored beside it. */
export async function assembleOutlook(site: Site, request: OutlookRequest) {
  const science = await scienceFor(site.organisationId, request.scenario)
  const components = science.map(s => s.component)
  const adoptedSeries = Object.fromEntries(science.map(s => [s.component, s.seriesId]))
  const [{ set, matrix, otherSeries }, scales] = await Promise.all([
    correlationFor(site.organisationId, request.scenario, components, adoptedSeries), scaleFactorsAt(site.latitude, site.longitude),
  ])
  const horizon = minOf(science.map(s => (s.release.anchorYears as number[]).at(-1)!))
  const baselineYear = site.referenceEpoch
  const years = outlookYears(baselineYear, horizon)
  const notes: OutlookNote[] = []
  const unscaled = components.filter(c => !scales.get(c)!.gridId)
  if (unscaled.length) notes.push({ kind: 'unscaled', components: unscaled })
  if (!set) notes.push({ kind: 'uncorrelated', scenario: request.scenario })
  if (otherSeries.length) notes.push({ kind: 'correlation-other-series', components: otherSeries })
  // Heights above the datum → metres above mean sea level at the epoch, where rise is counted from.
  const aboveEpochMean = (height: number) => height - site.datumOffset
  const hasStatistics = site.gumbelLocation !== null && site.gumbelScale !== null
  refuseFloodLevelsWithoutStatistics(site, hasStatistics)

  const input = {
    baselineYear,
    years,
    samples: request.samples,
    seed: request.seed,
    components: science.map(s => ({ key: s.component, scale: scales.get(s.component)!.factor, release: s.release })),
    ...(matrix ? { correlation: matrix } : {}),
    landMotion: { rateMmPerYear: site.landMotionRate, sigmaMmPerYear: site.landMotionSigma, epoch: site.landMotionEpoch },
    heights: HEIGHT_GRID,
    thresholds: site.thresholds.flatMap((t) => {
      const base = { key: t.id, height: aboveEpochMean(t.height), kind: t.kind }
      if (t.kind !== 'flood-level' || t.designLifeYears === null || t.buildYear === null) return [base]
      const lastYearOfLife = t.buildYear + t.designLifeYears - 1
      if (lastYearOfLife > years.at(-1)!) {
        notes.push({ kind: 'life-beyond-releases', threshold: t.label, lastYear: years.at(-1)! })
        return [base]
      }
      return [{ ...base, designLifeYears: t.designLifeYears, lifeStartYear: t.buildYear }]
    }),
    ...(hasStatistics ? { gumbel: { location: aboveEpochMean(site.gumbelLocation!), scale: site.gumbelScale!, ...fitUncertainty(site) } } : {}),
    // Not read by the engine: how to state its heights above the site's datum (part of the hash, so a
    // changed datum is a changed outlook).
    datum: { name: site.referenceLevel, kind: site.datumKind, offset: site.datumOffset, referenceEpoch: site.referenceEpoch } satisfies OutlookDatum,
  }
  const releaseRefs: OutlookReleaseRef[] = science.map(s => ({
    component: s.component, releaseId: s.releaseId, seriesId: s.seriesId, version: s.version, citation: s.citation, title: s.title,
    scale: scales.get(s.component)!.factor, scaleSource: scales.get(s.component)!.note,
  }))
  // Refuse a run the engine would refuse before anything is stored.
  asBadRequest(() => validateOutlookInput(input))
  const inputHash = createHash('sha256').update(JSON.stringify({ engine: ENGINE_VERSION, input })).digest('hex')
  return { input, inputHash, releaseRefs, notes, correlationSetId: set?.id ?? null }
}

/**
 * Runs an outlook, or finds the stored one with the same input hash. The run itself is queued
 * (see outlook-jobs.ts: any app instance may compute it); `run` resolves when it has finished.
 */
export async function requestOutlook(planner: CurrentUser, siteId: string, request: OutlookRequest) {
  const site = await loadSite(planner, siteId)
  const queued = await queueOutlook(site, request, planner.id)
  if (queued.cached) return { id: queued.id, cached: true, run: null }
  const db = await useDb()
  await writeAudit(db, planner, 'outlook.requested', { type: 'outlook', id: queued.id }, { site: siteId, scenario: request.scenario, samples: request.samples })
  return { id: queued.id, cached: false, run: awaitOutlook(queued.id) }
}

/**
 * Stores a new outlook to be computed (state running, no lease), unless one with the same input
 * hash is stored already: then that one is the answer. A failed one is replaced.
 */
export async function queueOutlook(site: Site, request: Pick<OutlookRequest, 'scenario' | 'samples' | 'seed'>, requestedBy: string | null) {
  const assembled = await assembleOutlook(site, request as OutlookRequest)
  const db = await useDb()
  const [stored] = await db.select({ id: outlooks.id, state: outlooks.state }).from(outlooks)
    .where(and(eq(outlooks.siteId, site.id), eq(outlooks.inputHash, assembled.inputHash)))
  if (stored && stored.state !== 'failed') return { id: stored.id, cached: true }
  if (stored) await db.delete(outlooks).where(and(eq(outlooks.id, stored.id), eq(outlooks.state, 'failed')))
  const [row] = await db.transaction(async (tx) => {
    // A person's request waits its turn within their organisation's quota; the organisation's row
    // lock makes the count and the insert one step, so a burst of requests cannot all pass.
    if (requestedBy) await assertOutlookQuota(tx, site.organisationId)
    return tx.insert(outlooks).values({
      siteId: site.id, scenario: request.scenario, samples: request.samples, seed: request.seed, inputHash: assembled.inputHash,
      engineVersion: ENGINE_VERSION, input: assembled.input, releaseRefs: assembled.releaseRefs, notes: assembled.notes,
      correlationSetId: assembled.correlationSetId, requestedBy,
    }).onConflictDoNothing().returning({ id: outlooks.id })
  })
  if (!row) {
    // Someone (here or on another instance) asked for the same outlook a moment ago: follow that run.
    const [twin] = await db.select({ id: outlooks.id }).from(outlooks).where(and(eq(outlooks.siteId, site.id), eq(outlooks.inputHash, assembled.inputHash)))
    return { id: twin!.id, cached: true }
  }
  kickOutlooks()
  return { id: row.id, cached: false }
}

/**
 * Since an outlook was computed: `new-version` a newer version in the series it used (still adopted),
 * `withdrawn` that series has no published version now, `adopted-other` the organisation has since
 * adopted another series for the component.
 */
export interface NewerScience {
  kind: 'new-version' | 'withdrawn' | 'adopted-other'
  component: string
  usedVersion: number
  latestVersion: number | null
  latestReleaseId: string | null
  seriesTitle: string | null
}

/** A published series the organisation has not adopted: offered, never applied by itself. */
export interface OfferedScience { component: string, seriesId: string, title: string, organisationName: string, version: number }

/** What changed in the science an outlook used, and which other published series are on offer. */
export async function newerScience(organisationId: string, scenario: string, refs: OutlookReleaseRef[]): Promise<{ newer: NewerScience[], offered: OfferedScience[] }> {
  const { adopted, published } = await adoptedForReading(`${organisationId}\n${scenario}`)
  const newer = refs.flatMap((ref): NewerScience[] => {
    const seriesId = adopted[ref.component] ?? ref.seriesId
    const now = published.find(row => row.seriesId === seriesId)
    const base = { component: ref.component, usedVersion: ref.version, latestVersion: now?.version ?? null, latestReleaseId: now?.releaseId ?? null, seriesTitle: now?.title ?? null }
    if (seriesId !== ref.seriesId) return [{ kind: 'adopted-other', ...base }]
    if (!now) return [{ kind: 'withdrawn', ...base }]
    return now.releaseId === ref.releaseId ? [] : [{ kind: 'new-version', ...base }]
  })
  const offered = published.filter(row => refs.some(ref => ref.component === row.component) && row.seriesId !== (adopted[row.component] ?? refs.find(ref => ref.component === row.component)!.seriesId))
    .map(row => ({ component: row.component, seriesId: row.seriesId, title: row.title, organisationName: row.organisationName, version: row.version }))
  return { newer, offered }
}

export async function listSiteOutlooks(siteId: string) {
  const db = await useDb()
  return db.select({
    id: outlooks.id, scenario: outlooks.scenario, samples: outlooks.samples, seed: outlooks.seed, state: outlooks.state,
    createdAt: outlooks.createdAt, finishedAt: outlooks.finishedAt, inputHash: outlooks.inputHash,
  }).from(outlooks).where(eq(outlooks.siteId, siteId)).orderBy(desc(outlooks.createdAt))
}

/** How many outlooks people of one organisation may have waiting or computing at once (OUTLOOK_QUEUE_PER_ORGANISATION). */
export const outlookQueueQuota = () => serverConfig().OUTLOOK_QUEUE_PER_ORGANISATION

type Tx = Parameters<Parameters<Awaited<ReturnType<typeof useDb>>['transaction']>[0]>[0]

/** 429 when the organisation already has its quota of requested outlooks waiting or computing. */
async function assertOutlookQuota(tx: Tx, organisationId: string) {
  await tx.select({ id: organisations.id }).from(organisations).where(eq(organisations.id, organisationId)).for('update')
  const [{ waiting } = { waiting: 0 }] = await tx.select({ waiting: count() }).from(outlooks).innerJoin(sites, eq(sites.id, outlooks.siteId))
    .where(and(eq(sites.organisationId, organisationId), eq(outlooks.state, 'running'), isNotNull(outlooks.requestedBy)))
  const quota = outlookQueueQuota()
  if (waiting >= quota) {
    throw createError({
      statusCode: 429,
      message: `Your organisation already has ${waiting} outlooks waiting or computing, the most it may queue at once (${quota}). Wait for one of them to finish, then ask again; stored outlooks open at once.`,
      data: { waiting, quota },
    })
  }
}
