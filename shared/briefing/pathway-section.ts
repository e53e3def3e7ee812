import type { PathwaySnapshot } from '../pathways/snapshot'

// A briefing may include the site's adaptation pathways and decision records. A draft shows them as
// they stand; issuing freezes them with the rest of the document: the measures, each pathway's
// tipping and decision years per scenario at its tolerances, the "already late" flags against the
// year of issue, and every record with what it rests on. Later edits and science leave it as issued.

export interface BriefingPathwaySection extends PathwaySnapshot {
  /** When it was frozen (the briefing's issue), as an ISO date-time; null while the briefing is a draft. */
  asOf: string | null
}

/** Only what the section shows, in plain JSON: nothing of the live rows (authors, outlook ids, raw tipping) is kept. */
export function pathwaySection(snapshot: PathwaySnapshot, asOf: string | null): BriefingPathwaySection {
  return {
    asOf,
    site: { referenceLevel: snapshot.site.referenceLevel, referenceEpoch: snapshot.site.referenceEpoch },
    currentYear: snapshot.currentYear,
    measures: snapshot.measures.map(m => ({
      id: m.id,
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
      id: p.id,
      name: p.name,
      illustrative: p.illustrative,
      measureIds: p.measureIds,
      tolerances: p.tolerances,
      decisions: p.decisions,
      spread: p.spread,
    })),
    records: snapshot.records.map(r => ({
      id: r.id,
      pathwayId: r.pathwayId,
      measureId: r.measureId,
      fromMeasureId: r.fromMeasureId,
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
      reviewsRecordId: r.reviewsRecordId,
    })),
  }
}
