import type { PathwaySnapshot } from '../pathways/snapshot'

// A briefing may include the site's adaptation pathways and decision records. A draft shows them as
// they stand; issuing freezes them with the rest of the document: the measures, each pathway's
// tipping and decision years per scenario at its tolerances, the "already late" flags against the
// year of issue, and every record with what it rests on. Later edits and science leave it as issued.

export interface BriefingPathwaySection extends PathwaySnapshot {
  /** When it was frozen (the briefing's issue), as an ISO date-time; null while the briefing is a draft. */
  asOf: string | null
}

/** Local keys (m1, p1, r1) for the rows' ids: a shared briefing names no record of the database. */
function localKeys(prefix: string, ids: string[]) {
  const keys = new Map(ids.map((id, i) => [id, `${prefix}${i + 1}`]))
  return (id: string) => keys.get(id) ?? `${prefix}?`
}

/**
 * Only what the section shows, in plain JSON: nothing of the live rows (authors, outlook ids, raw
 * tipping) is kept, and the rows are named by local keys.
 */
export function pathwaySection(snapshot: PathwaySnapshot, asOf: string | null): BriefingPathwaySection {
  const measure = localKeys('m', snapshot.measures.map(m => m.id))
  const pathway = localKeys('p', snapshot.pathways.map(p => p.id))
  const record = localKeys('r', snapshot.records.map(r => r.id))
  return {
    asOf,
    site: { referenceLevel: snapshot.site.referenceLevel, referenceEpoch: snapshot.site.referenceEpoch },
    currentYear: snapshot.currentYear,
    measures: snapshot.measures.map(m => ({
      id: measure(m.id),
      name: m.name,
      height: m.height,
      kind: m.kind,
      leadTimeYears: m.leadTimeYears,
      designLifeYears: m.designLifeYears,
      costBand: m.costBand,
    })),
    scenarios: snapshot.scenarios.map(s => ({
      scenario: s.scenario,
      horizon: s.horizon,
      inputHash: s.inputHash,
      releases: s.releases.map(r => ({ component: r.component, version: r.version, citation: r.citation })),
    })),
    pathways: snapshot.pathways.map(p => ({
      id: pathway(p.id),
      name: p.name,
      illustrative: p.illustrative,
      measureIds: p.measureIds.map(id => measure(id)),
      tolerances: p.tolerances,
      decisions: p.decisions.map(d => ({
        ...d,
        fromMeasureId: measure(d.fromMeasureId),
        toMeasureId: measure(d.toMeasureId),
      })),
      spread: p.spread.map(x => ({ ...x, toMeasureId: measure(x.toMeasureId) })),
    })),
    records: snapshot.records.map(r => ({
      id: record(r.id),
      pathwayId: pathway(r.pathwayId),
      measureId: measure(r.measureId),
      fromMeasureId: measure(r.fromMeasureId),
      scenario: r.scenario,
      tolerance: r.tolerance,
      tippingYear: r.tippingYear,
      decisionYear: r.decisionYear,
      horizon: r.horizon,
      leadTimeYears: r.leadTimeYears,
      rationale: r.rationale,
      outlookInputHash: r.outlookInputHash,
      engineVersion: r.engineVersion,
      releases: r.releases.map(x => ({ component: x.component, version: x.version, citation: x.citation })),
      decidedByName: r.decidedByName,
      decidedAt: new Date(r.decidedAt).toISOString(),
      reviewDate: r.reviewDate,
      reviewsRecordId: r.reviewsRecordId && record(r.reviewsRecordId),
    })),
  }
}
