import type { TippingYear } from './tipping'

// Decision years along a pathway (adaptive pathways: Haasnoot et al. 2013, Global Environmental
// Change; lead times as in Haasnoot et al. 2018). A measure serves until its tipping year; the next
// measure must be in place by then, so it has to be decided its lead time earlier.

export interface PathwayStepInput {
  measureId: string
  leadTimeYears: number
}

export interface ScenarioTipping {
  scenario: string
  /** Last year the outlook reaches: a tipping year of null means "not before" this year. */
  horizon: number
  /** Per measure id, its tipping years by tolerance. */
  tipping: Record<string, TippingYear[]>
}

export interface StepDecision {
  scenario: string
  tolerance: number
  /** The measure in service until it tips, and the one to decide on. */
  fromMeasureId: string
  toMeasureId: string
  tippingYear: number | null
  tippingEarliest: number | null
  tippingLatest: number | null
  leadTimeYears: number
  /** tippingYear − lead time of the next measure; null when the measure does not tip by the horizon. */
  decisionYear: number | null
  /** The decision year is before the current year: the lead time is longer than the time left. */
  alreadyLate: boolean
  horizon: number
}

export function decisionYear(tippingYear: number | null, leadTimeYears: number, currentYear: number) {
  if (tippingYear === null) return { decisionYear: null, alreadyLate: false }
  const year = tippingYear - leadTimeYears
  return { decisionYear: year, alreadyLate: year < currentYear }
}

/** Every step's decision per scenario and tolerance. */
export function pathwayDecisions(
  steps: PathwayStepInput[],
  scenarios: ScenarioTipping[],
  tolerances: number[],
  currentYear: number,
): StepDecision[] {
  const out: StepDecision[] = []
  for (let i = 0; i + 1 < steps.length; i++) {
    const from = steps[i]!
    const to = steps[i + 1]!
    for (const scenario of scenarios) {
      for (const tolerance of tolerances) {
        const tip = scenario.tipping[from.measureId]?.find(t => t.tolerance === tolerance)
        const tippingYear = tip?.year ?? null
        out.push({
          scenario: scenario.scenario,
          tolerance,
          fromMeasureId: from.measureId,
          toMeasureId: to.measureId,
          tippingYear,
          tippingEarliest: tip?.earliest ?? null,
          tippingLatest: tip?.latest ?? null,
          leadTimeYears: to.leadTimeYears,
          horizon: scenario.horizon,
          ...decisionYear(tippingYear, to.leadTimeYears, currentYear),
        })
      }
    }
  }
  return out
}

export interface DecisionSpread {
  toMeasureId: string
  tolerance: number
  /** Earliest and latest decision year across scenarios, with the scenarios that give them. */
  earliest: { year: number, scenario: string } | null
  latest: { year: number, scenario: string } | null
  /** Scenarios in which the measure before does not tip by the horizon (no decision needed by then). */
  notWithinHorizon: Array<{ scenario: string, horizon: number }>
  alreadyLate: boolean
}

/** The main message: between which years, across scenarios, each decision falls. */
export function decisionSpread(decisions: StepDecision[]): DecisionSpread[] {
  const groups = new Map<string, StepDecision[]>()
  for (const d of decisions) {
    const key = `${d.toMeasureId}|${d.tolerance}`
    groups.set(key, [...(groups.get(key) ?? []), d])
  }
  return [...groups.values()].map((group) => {
    const timed = group.filter(d => d.decisionYear !== null).sort((a, b) => a.decisionYear! - b.decisionYear!)
    const first = timed[0]
    const last = timed.at(-1)
    return {
      toMeasureId: group[0]!.toMeasureId,
      tolerance: group[0]!.tolerance,
      earliest: first ? { year: first.decisionYear!, scenario: first.scenario } : null,
      latest: last ? { year: last.decisionYear!, scenario: last.scenario } : null,
      notWithinHorizon: group
        .filter(d => d.decisionYear === null)
        .map(d => ({ scenario: d.scenario, horizon: d.horizon })),
      alreadyLate: group.some(d => d.alreadyLate),
    }
  })
}
