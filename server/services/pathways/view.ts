import { decisionSpread, pathwayDecisions } from '#shared/pathways/decisions'
import { DEFAULT_PATHWAY_TOLERANCES } from '#shared/pathways/schemas'
import type { CurrentUser } from '../../utils/auth'
import { loadSite } from '../sites'
import { siteTipping } from './evaluation'
import { openAlerts, siteMeasures, sitePathways, siteRecords, type Measure, type Pathway } from './store'

/** The calendar year "already late" is judged against; tipping years themselves never read the clock. */
export const currentYear = () => new Date().getUTCFullYear()

export function stepsOf(pathway: Pathway, measures: Measure[]) {
  return pathway.measureIds.flatMap((id) => {
    const measure = measures.find(m => m.id === id)
    return measure ? [{ measureId: measure.id, leadTimeYears: measure.leadTimeYears }] : []
  })
}

/**
 * A site's measures, its pathways with their tipping and decision years under each scenario's latest
 * outlook, and its decision records, as they stand now (the pathways page and a briefing's section).
 */
export async function siteDecisions(siteId: string) {
  const [measures, pathways, records] = await Promise.all([
    siteMeasures(siteId),
    sitePathways(siteId),
    siteRecords(siteId),
  ])
  const tolerances = [
    ...new Set(pathways.length ? pathways.flatMap(p => p.tolerances) : DEFAULT_PATHWAY_TOLERANCES),
  ].sort((a, b) => a - b)
  const { scenarios, computing } = await siteTipping(siteId, measures, tolerances)
  const year = currentYear()
  return {
    currentYear: year,
    measures,
    /** Scenarios whose tipping years for these measures are still being computed (left out of `scenarios`). */
    computing,
    scenarios: scenarios.map(s => ({
      scenario: s.scenario,
      horizon: s.horizon,
      outlookId: s.outlookId,
      inputHash: s.inputHash,
      tipping: s.tipping,
      releases: s.releaseRefs.map(r => ({ component: r.component, version: r.version, citation: r.citation })),
    })),
    pathways: pathways.map((pathway) => {
      const decisions = pathwayDecisions(stepsOf(pathway, measures), scenarios, pathway.tolerances, year)
      return { ...pathway, decisions, spread: decisionSpread(decisions) }
    }),
    records,
  }
}

/** Everything the site's pathways section shows: measures, pathways with their decisions, records, alerts. */
export async function pathwaysView(user: CurrentUser, siteId: string) {
  const site = await loadSite(user, siteId)
  const { records, ...decisions } = await siteDecisions(siteId)
  return {
    site: {
      id: site.id,
      name: site.name,
      referenceLevel: site.referenceLevel,
      datumOffset: site.datumOffset,
      referenceEpoch: site.referenceEpoch,
    },
    ...decisions,
    records: records.map(({ decidedBy: _decidedBy, ...record }) => record),
    alerts: await openAlerts(siteId, records),
    canEdit: user.role === 'planner',
  }
}

export type PathwaysView = Awaited<ReturnType<typeof pathwaysView>>
