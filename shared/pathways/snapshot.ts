import type { ThresholdKind } from '../types/science'
import type { DecisionSpread, StepDecision } from './decisions'
import type { PathwayText } from './text'

// What a laid-out pathways section shows: the site's measures, each pathway with its decisions per
// scenario and tolerance, the decision records and the outlooks they come from. The live pathways
// view carries these fields, and an issued briefing freezes them (shared/briefing/pathway-section.ts),
// so the pathways PDF and the briefing lay out the same thing.

export interface SnapshotMeasure {
  id: string
  name: string
  /** Metres above the site's datum; null for a measure without a height. */
  height: number | null
  kind: ThresholdKind
  leadTimeYears: number
  designLifeYears: number | null
  costBand: string | null
}

export interface SnapshotPathway {
  id: string
  name: string
  illustrative: boolean
  measureIds: string[]
  tolerances: number[]
  decisions: StepDecision[]
  spread: DecisionSpread[]
}

export interface SnapshotRecord {
  id: string
  pathwayId: string
  measureId: string
  fromMeasureId: string
  scenario: string
  tolerance: number
  tippingYear: number | null
  decisionYear: number | null
  horizon: number
  leadTimeYears: number
  rationale: string
  outlookInputHash: string
  engineVersion: string
  releases: Array<{ component: string, version: number, citation: string }>
  decidedByName: string
  /** An ISO date-time (a Date before it is sent). */
  decidedAt: string | Date
  reviewDate: string
  reviewsRecordId: string | null
}

export interface PathwaySnapshot {
  site: { referenceLevel: string, referenceEpoch: number }
  /** The year "already late" was judged against. */
  currentYear: number
  measures: SnapshotMeasure[]
  scenarios: Array<{
    scenario: string
    horizon: number
    inputHash: string
    releases: Array<{ component: string, version: number, citation: string }>
  }>
  pathways: SnapshotPathway[]
  records: SnapshotRecord[]
}

/** The years the charts span: from the reference epoch (or today) to the last horizon, ten years ahead at least. */
export function chartYears(snapshot: Pick<PathwaySnapshot, 'site' | 'currentYear' | 'scenarios'>) {
  return {
    startYear: Math.min(snapshot.site.referenceEpoch, snapshot.currentYear),
    endYear: Math.max(snapshot.currentYear + 10, ...snapshot.scenarios.map(s => s.horizon)),
  }
}

/** The main message of one decision: between which years, across scenarios, it falls; then where it is not needed. */
export function spreadSentence(spread: DecisionSpread, names: Record<string, string>, text: PathwayText) {
  const measure = names[spread.toMeasureId] ?? ''
  const main = !spread.earliest || !spread.latest
    ? text.spreadNone(measure)
    : spread.earliest.year === spread.latest.year
      ? text.spreadSingle(measure, spread.earliest.year, spread.earliest.scenario)
      : text.spreadBetween(
          measure,
          spread.earliest.year,
          spread.earliest.scenario,
          spread.latest.year,
          spread.latest.scenario,
        )
  const extra = spread.notWithinHorizon.length
    ? text.notWithin(spread.notWithinHorizon.map(n => n.scenario).join(', '), spread.notWithinHorizon[0]!.horizon)
    : null
  return { main, extra }
}
