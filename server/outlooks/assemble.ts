import { createHash } from 'node:crypto'
import { validateOutlookInput } from '#shared/engine'
import type { ReleaseInput } from '#shared/engine/schema'
import { minOf } from '#shared/engine/arrays'
import { ENGINE_VERSION } from '#shared/engine/version'
import type { OutlookRequest } from '#shared/schemas/sites'
import type { OutlookNote } from '#shared/types/outlook-notes'
import type { OutlookDatum, OutlookLandDraws, OutlookReleaseRef, StoredOutlookInput } from '#shared/types/outlook'
import { correlationFor, scaleFactorsAt, scienceFor } from '../services/science-inputs'
import type { loadSite } from '../services/sites'
import { latestGaugeRecord } from '../services/gauge-records'
import { latestLandMotionDraws } from '../services/land-motion-draws'
import { observationsForOutlook } from '#shared/observations/outlook-record'

export type Site = Awaited<ReturnType<typeof loadSite>>

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
  for (let year = Math.floor(referenceEpoch / DECADE) * DECADE + DECADE; year <= horizon; year += DECADE)
    years.push(year)
  return years
}

/**
 * A fitted site's parameter uncertainty, sampled with each trajectory. Only the standard errors are
 * stored, so location and scale are drawn as uncorrelated: a stated simplification (the two estimates
 * of a Gumbel fit correlate by about 0.3 [memory: asymptotic covariance of the Gumbel MLE]).
 */
function fitUncertainty(site: Site) {
  return site.gumbelLocationSe !== null && site.gumbelScaleSe !== null
    ? { locationSe: site.gumbelLocationSe, scaleSe: site.gumbelScaleSe }
    : {}
}

/**
 * A flood level is compared with the total water level, which needs the site's extreme-water
 * statistics. Leaving it out of the run would give an outlook that silently lacks a threshold the
 * planner asked for, so the run is refused and says what to fix.
 */
function refuseFloodLevelsWithoutStatistics(site: Site, hasStatistics: boolean) {
  if (hasStatistics) return
  const issues = site.thresholds.flatMap((t, index) =>
    t.kind === 'flood-level'
      ? [
          {
            field: `thresholds.${index}.kind`,
            message: `The flood level "${t.label}" is compared with the total water level and needs the site's extreme-water statistics (Gumbel location and scale); enter them on the site, or make it a mean-sea-level threshold.`,
          },
        ]
      : [],
  )
  if (issues.length)
    throw createError({
      statusCode: 400,
      message: issues.map(issue => `${issue.field}: ${issue.message}`).join(' '),
      data: { issues },
    })
}

/** The latest gauge record as the engine's `observations`, when it has a fit and values since the epoch. */
function observedSince(gauge: Awaited<ReturnType<typeof latestGaugeRecord>>, site: Site, lastYear: number) {
  const observations
    = gauge && observationsForOutlook(gauge, gauge.fit, site.datumOffset, site.referenceEpoch, lastYear)
  return observations ? { observations } : {}
}

type Science = Awaited<ReturnType<typeof scienceFor>>

/**
 * The site's land motion for the engine: its latest uploaded draws when it has any (joint with their
 * linked release when this outlook uses that release, independent otherwise), else its rate and sigma.
 */
function landMotionOf(site: Site, draws: Awaited<ReturnType<typeof latestLandMotionDraws>>, science: Science) {
  const epoch = site.landMotionEpoch
  if (!draws) return { landMotion: { rateMmPerYear: site.landMotionRate, sigmaMmPerYear: site.landMotionSigma, epoch } }
  const linked = science.find(s => s.releaseId === draws.linkedReleaseId)
  const provenance: OutlookLandDraws = {
    version: draws.version,
    source: draws.source,
    reference: draws.reference,
    summary: draws.summary,
    joint: linked
      ? { component: linked.component, releaseId: linked.releaseId, title: linked.title, version: linked.version }
      : null,
  }
  return {
    landMotion: { draws: draws.draws, epoch, ...(linked ? { jointWith: linked.component } : {}) },
    landMotionDraws: provenance,
  }
}

/** Everything that goes into one run, with the provenance stored beside it. */
export async function assembleOutlook(site: Site, request: OutlookRequest) {
  const science = await scienceFor(site.organisationId, request.scenario)
  const components = science.map(s => s.component)
  const adoptedSeries = Object.fromEntries(science.map(s => [s.component, s.seriesId]))
  const [{ set, matrix, otherSeries }, scales, gauge, landDraws] = await Promise.all([
    correlationFor(site.organisationId, request.scenario, components, adoptedSeries),
    scaleFactorsAt(site.latitude, site.longitude),
    latestGaugeRecord(site.id),
    latestLandMotionDraws(site.id),
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

  const input: StoredOutlookInput = {
    baselineYear,
    years,
    samples: request.samples,
    seed: request.seed,
    // A published release passed the engine's release checks when it was approved; validateOutlookInput
    // below checks the whole input again before anything is stored.
    components: science.map(s => ({
      key: s.component,
      scale: scales.get(s.component)!.factor,
      release: s.release as ReleaseInput,
    })),
    ...(matrix ? { correlation: matrix } : {}),
    ...landMotionOf(site, landDraws, science),
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
    ...(hasStatistics
      ? {
          gumbel: { location: aboveEpochMean(site.gumbelLocation!), scale: site.gumbelScale!, ...fitUncertainty(site) },
        }
      : {}),
    // The site's gauge record since the epoch weighs the trajectories (observation-updated outlook).
    ...observedSince(gauge, site, years.at(-1)!),
    // Not read by the engine: how to state its heights above the site's datum (part of the hash, so a
    // changed datum is a changed outlook).
    datum: {
      name: site.referenceLevel,
      kind: site.datumKind,
      offset: site.datumOffset,
      referenceEpoch: site.referenceEpoch,
    } satisfies OutlookDatum,
  }
  const releaseRefs: OutlookReleaseRef[] = science.map(s => ({
    component: s.component,
    releaseId: s.releaseId,
    seriesId: s.seriesId,
    version: s.version,
    citation: s.citation,
    title: s.title,
    scale: scales.get(s.component)!.factor,
    scaleSource: scales.get(s.component)!.note,
  }))
  // Refuse a run the engine would refuse before anything is stored.
  asBadRequest(() => validateOutlookInput(input))
  const inputHash = createHash('sha256').update(JSON.stringify({ engine: ENGINE_VERSION, input })).digest('hex')
  return { input, inputHash, releaseRefs, notes, correlationSetId: set?.id ?? null }
}
