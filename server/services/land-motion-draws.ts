import { and, desc, eq, inArray, sql } from 'drizzle-orm'
import { landMotionDraws, outlooks, releaseDraws, releases, series } from '~~/server/db/schema'
import type { LandMotionDrawsUpload } from '#shared/schemas/sites'
import type { LandMotionDrawsReply, LandMotionDrawsWork } from '../workers/land-motion-draws-worker'
import { checkOffThread, type CheckWording } from '../utils/checking-thread'
import type { CurrentUser } from '../utils/auth'
import { loadSite } from './sites'
import { nextUploadVersion, queueSiteRecomputation } from './site-uploads'

// A site's land motion as posterior draws: uploads are versions (the latest is what outlooks use,
// earlier ones are kept), each optionally joint with one release of draws from the site's outlooks.

const DRAWS_WORDING: CheckWording = {
  crowded: 'Many uploads are being checked just now. Try again in a minute.',
  overBudget: seconds =>
    `Checking these land-motion draws took longer than ${seconds} s, so it was stopped. Try again when the server is less busy.`,
}

/**
 * The upload's rates in draw order, as the JSON the column stores, and their summary: parsed and checked
 * on a worker thread (server/workers/land-motion-draws-worker.ts); a 400 naming each row to fix, or a 503.
 */
async function parseDrawsOffThread(csv: string) {
  const work: LandMotionDrawsWork = { csv }
  const reply = await checkOffThread<LandMotionDrawsReply>('land-motion-draws-worker', work, DRAWS_WORDING)
  if (!reply.drawsJson || !reply.summary) throw new Error(reply.error ?? 'The land-motion draws worker gave no answer.')
  return { drawsJson: reply.drawsJson, summary: reply.summary }
}

/**
 * Releases a site's draws may be joint with: releases of draws that the site's outlooks used, with their
 * draw counts (the page offers those with as many draws as the file).
 */
export async function linkableReleases(siteId: string) {
  const db = await useDb()
  const used = await db.selectDistinct({ refs: outlooks.releaseRefs }).from(outlooks).where(eq(outlooks.siteId, siteId))
  const ids = [...new Set(used.flatMap(row => row.refs.map(ref => ref.releaseId)))]
  if (!ids.length) return []
  return db
    .select({
      releaseId: releases.id,
      component: series.component,
      scenario: series.scenario,
      title: series.title,
      version: releases.version,
      draws: releaseDraws.drawCount,
    })
    .from(releases)
    .innerJoin(series, eq(series.id, releases.seriesId))
    .innerJoin(releaseDraws, eq(releaseDraws.releaseId, releases.id))
    .where(and(inArray(releases.id, ids), eq(releases.form, 'samples')))
    .orderBy(series.component, series.scenario, desc(releases.version))
}

export async function uploadLandMotionDraws(
  planner: CurrentUser,
  siteId: string,
  upload: LandMotionDrawsUpload,
) {
  const site = await loadSite(planner, siteId)
  const { drawsJson, summary } = await parseDrawsOffThread(upload.csv)
  if (upload.linkedReleaseId) {
    const linked = (await linkableReleases(siteId)).find(release => release.releaseId === upload.linkedReleaseId)
    const issue = !linked
      ? 'is not a release of draws used by this site\'s outlooks; choose one from the list, or none'
      : linked.draws !== summary.count
        ? `has ${linked.draws} draws and the file ${summary.count}; a joint link pairs draw j with draw j, so upload one rate per release draw, or choose none`
        : null
    if (issue) {
      const message = `linkedReleaseId: the release ${issue}.`
      throw createError({ statusCode: 400, message, data: { issues: [{ field: 'linkedReleaseId', message }] } })
    }
  }
  const db = await useDb()
  const stored = await db.transaction(async (tx) => {
    const version = await nextUploadVersion(tx, siteId, landMotionDraws)
    const [row] = await tx
      .insert(landMotionDraws)
      .values({
        siteId,
        version,
        draws: sql`${drawsJson}::jsonb`,
        summary,
        source: upload.source,
        reference: upload.reference,
        linkedReleaseId: upload.linkedReleaseId,
        uploadedBy: planner.id,
      })
      .returning({ id: landMotionDraws.id, version: landMotionDraws.version })
    await writeAudit(
      tx,
      planner,
      'site.land-motion-draws',
      { type: 'site', id: siteId },
      { site: site.name, version, draws: summary.count, linkedRelease: upload.linkedReleaseId },
    )
    const cause = { kind: 'land-motion-draws', site: site.name, version } as const
    return { ...row!, summary, updatingScenarios: await queueSiteRecomputation(tx, siteId, cause) }
  })
  kickJobs()
  return stored
}

/** The latest draws of a site with their linked release, or null: what its outlooks use. */
export async function latestLandMotionDraws(siteId: string) {
  const db = await useDb()
  const [row] = await db.select().from(landMotionDraws).where(eq(landMotionDraws.siteId, siteId))
    .orderBy(desc(landMotionDraws.version)).limit(1)
  return row ?? null
}

/** The latest version's summary (not the draws), the versions before it, and the releases it may link to. */
export async function readLandMotionDraws(user: CurrentUser, siteId: string) {
  await loadSite(user, siteId)
  const db = await useDb()
  const versions = await db
    .select({
      version: landMotionDraws.version,
      createdAt: landMotionDraws.createdAt,
      summary: landMotionDraws.summary,
      source: landMotionDraws.source,
      reference: landMotionDraws.reference,
      linkedReleaseId: landMotionDraws.linkedReleaseId,
    })
    .from(landMotionDraws)
    .where(eq(landMotionDraws.siteId, siteId))
    .orderBy(desc(landMotionDraws.version))
  const linkable = await linkableReleases(siteId)
  const latest = versions[0]
  const linked = latest?.linkedReleaseId
    ? linkable.find(release => release.releaseId === latest.linkedReleaseId)
    : undefined
  return { latest: latest ? { ...latest, linkedRelease: linked ?? null } : null, versions, linkable }
}
