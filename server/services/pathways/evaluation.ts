import { createHash } from 'node:crypto'
import type { outlooks } from '~~/server/db/schema'
import type { OutlookReleaseRef } from '#shared/types/outlook'
import { ENGINE_VERSION } from '#shared/engine/version'
import { evaluateMeasures } from '#shared/pathways/evaluate-measures'
import type { ScenarioTipping } from '#shared/pathways/decisions'
import { latestOutlooks } from '../notify'
import type { Measure } from './store'

// Tipping years of a site's measures under each scenario's latest finished outlook. The engine runs
// on the outlook's own input (science, seed, samples) with the measures as thresholds, so the numbers
// are reproducible from the outlook's input hash; results are kept in memory by that hash.

type Outlook = typeof outlooks.$inferSelect

export interface ScenarioEvaluation extends ScenarioTipping {
  outlookId: string
  inputHash: string
  releaseRefs: OutlookReleaseRef[]
}

const CACHE_LIMIT = 200
const cache = new Map<string, ScenarioTipping>()

function engineHeights(outlook: Outlook, measures: Measure[]) {
  const input = outlook.input
  const offset = input.datum?.offset ?? 0
  // A measure without a height never tips; a flood level needs the outlook's extreme-water statistics.
  return measures.flatMap(m => m.height === null || (m.kind === 'flood-level' && !input.gumbel)
    ? []
    : [{ key: m.id, height: m.height - offset, kind: m.kind }])
}

export function evaluateOutlook(outlook: Outlook, measures: Measure[], tolerances: number[]): ScenarioEvaluation {
  const heights = engineHeights(outlook, measures)
  const key = createHash('sha256')
    .update(JSON.stringify([ENGINE_VERSION, outlook.inputHash, heights, tolerances]))
    .digest('hex')
  let tipping = cache.get(key)
  if (!tipping) {
    const input = outlook.input
    const evaluated = heights.length
      ? evaluateMeasures(input, heights, tolerances)
      : { horizon: input.years.at(-1)!, measures: [] }
    tipping = {
      scenario: outlook.scenario,
      horizon: evaluated.horizon,
      tipping: Object.fromEntries(evaluated.measures.map(m => [m.key, m.tipping])),
    }
    if (cache.size >= CACHE_LIMIT) cache.delete(cache.keys().next().value!)
    cache.set(key, tipping)
  }
  return { ...tipping, outlookId: outlook.id, inputHash: outlook.inputHash, releaseRefs: outlook.releaseRefs }
}

/** Every scenario with a finished outlook for the site, in name order. */
export async function evaluateSite(siteId: string, measures: Measure[], tolerances: number[]) {
  const latest = (await latestOutlooks(siteId)).sort((a, b) => a.scenario.localeCompare(b.scenario))
  return latest.flatMap((outlook) => {
    try {
      return [evaluateOutlook(outlook, measures, tolerances)]
    }
    catch (error) {
      // An outlook stored under rules the engine no longer accepts is left out, not turned into a 500;
      // the next recomputation replaces it.
      console.error(
        `[brinkwater] pathways: outlook ${outlook.id} could not be evaluated:`,
        error instanceof Error ? error.message : error,
      )
      return []
    }
  })
}
