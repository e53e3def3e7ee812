import { and, desc, eq, inArray } from 'drizzle-orm'
import { outlooks, sites, thresholds } from '~~/server/db/schema'
import { outlookCsv } from '#shared/exports/outlook-csv'
import { sitesGeoJson } from '#shared/exports/sites-geojson'
import type { CurrentUser } from '../utils/auth'

// Files for engineers and GIS: an outlook as CSV, the organisation's sites as GeoJSON.

/** A finished outlook of the caller's organisation as CSV, with a file name that says what it is. */
export async function outlookCsvExport(user: CurrentUser, id: string) {
  const db = await useDb()
  const [row] = await db
    .select({ outlook: outlooks, site: sites })
    .from(outlooks)
    .innerJoin(sites, eq(sites.id, outlooks.siteId))
    .where(eq(outlooks.id, id))
  if (!row || row.site.organisationId !== user.organisationId)
    throw createError({ statusCode: 404, message: 'No such outlook.' })
  const { outlook, site } = row
  if (outlook.state !== 'done' || !outlook.result)
    throw createError({ statusCode: 409, message: 'This outlook has not finished; download it once it is done.' })
  const labels = await db
    .select({ id: thresholds.id, label: thresholds.label })
    .from(thresholds)
    .where(eq(thresholds.siteId, site.id))
  // The datum the outlook was computed with; outlooks stored before datums were kept use the site's now.
  const datum = outlook.input.datum ?? {
    name: site.referenceLevel,
    kind: site.datumKind,
    offset: site.datumOffset,
    referenceEpoch: site.referenceEpoch,
  }
  const csv = outlookCsv(
    {
      siteName: site.name,
      scenario: outlook.scenario,
      datum,
      samples: outlook.samples,
      seed: outlook.seed,
      engineVersion: outlook.engineVersion,
      inputHash: outlook.inputHash,
      finishedAt: outlook.finishedAt?.toISOString() ?? null,
      releases: outlook.releaseRefs.map(r => ({
        component: r.component,
        version: r.version,
        citation: r.citation,
        scale: r.scale,
      })),
      labels: Object.fromEntries(labels.map(t => [t.id, t.label])),
    },
    outlook.result,
  )
  const name = `brinkwater-${site.name}-${outlook.scenario}-${outlook.inputHash.slice(0, 8)}`
    .toLowerCase()
    .normalize('NFKD')
    .replace(/[^\w.-]+/g, '-')
  return { csv, name: `${name}.csv` }
}

/** The caller's organisation's sites with their headline under each one's planning scenario. */
export async function sitesGeoJsonExport(user: CurrentUser) {
  const db = await useDb()
  const rows = await db.select().from(sites).where(eq(sites.organisationId, user.organisationId)).orderBy(sites.name)
  const ids = rows.map(s => s.id)
  const planned = ids.length
    ? await db
        .selectDistinctOn([outlooks.siteId], {
          siteId: outlooks.siteId,
          id: outlooks.id,
          headline: outlooks.headline,
          inputHash: outlooks.inputHash,
          finishedAt: outlooks.finishedAt,
        })
        .from(outlooks)
        .innerJoin(sites, eq(sites.id, outlooks.siteId))
        .where(
          and(inArray(outlooks.siteId, ids), eq(outlooks.state, 'done'), eq(outlooks.scenario, sites.planningScenario)),
        )
        .orderBy(outlooks.siteId, desc(outlooks.finishedAt))
    : []
  return sitesGeoJson(rows.map(site => ({ site, outlook: planned.find(o => o.siteId === site.id) ?? null })))
}
