import { count, eq } from 'drizzle-orm'
import { adaptationPathways, decisionRecords } from '~~/server/db/schema'
import { pathwaySection } from '#shared/briefing/pathway-section'
import { siteDecisions } from './view'

// The pathways section of a briefing, and whether a site has anything to put in one. Callers have
// checked the site is the caller's.

export async function briefingPathwaySection(
  site: { id: string, referenceLevel: string, referenceEpoch: number },
  asOf: Date | null,
) {
  const decisions = await siteDecisions(site.id)
  return pathwaySection({ site, ...decisions }, asOf?.toISOString() ?? null)
}

/** How many pathways and decision records the site has: the briefing form offers the section only with a pathway. */
export async function pathwayCounts(siteId: string) {
  const db = await useDb()
  const [[pathways], [records]] = await Promise.all([
    db.select({ n: count() }).from(adaptationPathways).where(eq(adaptationPathways.siteId, siteId)),
    db.select({ n: count() }).from(decisionRecords).where(eq(decisionRecords.siteId, siteId)),
  ])
  return { pathways: pathways?.n ?? 0, records: records?.n ?? 0 }
}
