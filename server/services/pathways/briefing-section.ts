import { count, eq } from 'drizzle-orm'
import { adaptationPathways, decisionRecords } from '~~/server/db/schema'
import { pathwaySection } from '#shared/briefing/pathway-section'
import { latestOutlooks } from '../notify'
import { ensureTipping } from './evaluation'
import { siteDecisions } from './view'

// The pathways section of a briefing, and whether a site has anything to put in one. Callers have
// checked the site is the caller's.

export async function briefingPathwaySection(
  site: { id: string, referenceLevel: string, referenceEpoch: number },
  asOf: Date | null,
) {
  let decisions = await siteDecisions(site.id)
  if (asOf && decisions.computing.length) {
    // Issuing freezes the section: compute the scenarios still being worked out now, rather than
    // freeze a section that silently lacks them.
    const outlooks = (await latestOutlooks(site.id)).filter(o => decisions.computing.includes(o.scenario))
    for (const outlook of outlooks) await ensureTipping(outlook, decisions.measures, [])
    decisions = await siteDecisions(site.id)
  }
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
