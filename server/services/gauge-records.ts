import { desc, eq, sql } from 'drizzle-orm'
import { gaugeRecords } from '~~/server/db/schema'
import { gaugePoints, parseGaugeRecordCsv } from '#shared/observations/gauge-record'
import { fitGaugeTrend, GaugeFitError, type GaugeTrendFit } from '#shared/observations/gauge-trend'
import { trackAgainstOutlook, type Tracking } from '#shared/observations/tracking'
import type { CurrentUser } from '../utils/auth'
import { latestOutlooks } from './notify'
import { loadSite } from './sites'
import { nextUploadVersion, queueSiteRecomputation } from './site-uploads'

// A site's tide-gauge record: uploads are versions (the latest is shown, earlier ones are kept), the
// fit is made once at upload, and tracking against the site's outlooks is worked out on read, so a
// new outlook is compared without a new upload. An upload queues the site's latest outlooks again, so
// their observation-updated numbers rest on the new version (an unchanged input hashes the same and
// is left alone).

function fitOrIssue(
  points: ReturnType<typeof gaugePoints>,
  resolution: 'annual' | 'monthly',
): { fit: GaugeTrendFit | null, fitIssue: string | null } {
  try {
    return { fit: fitGaugeTrend(points, resolution), fitIssue: null }
  }
  catch (error) {
    if (error instanceof GaugeFitError) return { fit: null, fitIssue: error.message }
    throw error
  }
}

/**
 * Stores a new version and queues the recomputation of the site's latest finished outlook of each
 * scenario; `updatingScenarios` names those scenarios, for the answer to say they are being brought up
 * to date.
 */
export async function uploadGaugeRecord(planner: CurrentUser, siteId: string, csv: string) {
  const site = await loadSite(planner, siteId)
  const record = asBadRequest(() => parseGaugeRecordCsv(csv))
  const { fit, fitIssue } = fitOrIssue(gaugePoints(record), record.resolution)
  const db = await useDb()
  const stored = await db.transaction(async (tx) => {
    const version = await nextUploadVersion(tx, siteId, gaugeRecords)
    const [row] = await tx
      .insert(gaugeRecords)
      .values({
        siteId,
        version,
        resolution: record.resolution,
        values: record.values,
        gaps: record.gaps,
        fit,
        fitIssue,
        uploadedBy: planner.id,
      })
      .returning({ id: gaugeRecords.id, version: gaugeRecords.version })
    await writeAudit(
      tx,
      planner,
      'site.gauge-record',
      { type: 'site', id: siteId },
      { site: site.name, version, values: record.values.length, resolution: record.resolution },
    )
    const cause = { kind: 'gauge-record', site: site.name, version } as const
    return { ...row!, updatingScenarios: await queueSiteRecomputation(tx, siteId, cause) }
  })
  kickJobs()
  return stored
}

export interface ScenarioTracking { scenario: string, outlookId: string, epoch: number, tracking: Tracking | null }

function trackingFor(
  fit: GaugeTrendFit,
  outlook: Awaited<ReturnType<typeof latestOutlooks>>[number],
): ScenarioTracking {
  // latestOutlooks reads finished outlooks only, which have their results.
  const result = outlook.result!
  const datum = outlook.input.datum
  const epoch = datum?.referenceEpoch ?? result.baselineYear
  const level = (year: (typeof result.byYear)[number], p: number) =>
    year.percentiles.find(entry => Math.abs(entry.level - p) < 1e-9)?.value
  const fan = result.byYear.flatMap((year) => {
    const p17 = level(year, 0.17)
    const p83 = level(year, 0.83)
    return p17 === undefined || p83 === undefined ? [] : [{ year: year.year, p17, p83 }]
  })
  return {
    scenario: outlook.scenario,
    outlookId: outlook.id,
    epoch,
    tracking: trackAgainstOutlook(fit, epoch, datum?.offset ?? 0, fan),
  }
}

/** The latest version of a site's gauge record, or null: what its outlooks are weighted by. */
export async function latestGaugeRecord(siteId: string) {
  const db = await useDb()
  const [record] = await db
    .select()
    .from(gaugeRecords)
    .where(eq(gaugeRecords.siteId, siteId))
    .orderBy(desc(gaugeRecords.version))
    .limit(1)
  return record ?? null
}

/** The latest version of a site's gauge record, the versions before it, and tracking per scenario. */
export async function readGaugeRecord(user: CurrentUser, siteId: string) {
  await loadSite(user, siteId)
  const db = await useDb()
  const versions = await db
    .select({
      id: gaugeRecords.id,
      version: gaugeRecords.version,
      createdAt: gaugeRecords.createdAt,
      values: sql<number>`jsonb_array_length(${gaugeRecords.values})`,
    })
    .from(gaugeRecords)
    .where(eq(gaugeRecords.siteId, siteId))
    .orderBy(desc(gaugeRecords.version))
  if (!versions.length) return { record: null, versions: [], tracking: [] }
  const [record] = await db.select().from(gaugeRecords).where(eq(gaugeRecords.id, versions[0]!.id))
  const tracking = record!.fit ? (await latestOutlooks(siteId)).map(outlook => trackingFor(record!.fit!, outlook)) : []
  return {
    record: record!,
    versions: versions.map(({ id: _id, ...version }) => version),
    tracking,
  }
}
