import { createHash } from 'node:crypto'
import { and, desc, eq, inArray, ne, sql } from 'drizzle-orm'
import { adaptationMeasures, outlooks, tippingEvaluations } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import type { OutlookReleaseRef } from '#shared/types/outlook'
import { EngineInputError } from '#shared/engine'
import { ENGINE_VERSION } from '#shared/engine/version'
import { measureChances, measuresPlan, tippingOf, type MeasureHeight } from '#shared/pathways/evaluate-measures'
import type { ScenarioTipping } from '#shared/pathways/decisions'
import { runPlanOffThread } from '../../outlooks/pool'
import type { Measure } from './store'

// Tipping years of a site's measures under each scenario's latest finished outlook. The engine runs
// on the outlook's own input (science, seed, samples) with the measures as thresholds, on the outlook
// worker pool, when the outlook finishes or the measures change; what it gives (each measure's chance
// in every year) is stored in `tipping_evaluations`, and reads take tipping years at any tolerance
// from it. A read that finds none queues one and reports the scenario as being computed.

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0]
type Executor = Pick<Tx, 'select' | 'selectDistinctOn' | 'insert'>
type Outlook = typeof outlooks.$inferSelect
type Evaluation = typeof tippingEvaluations.$inferSelect

export interface ScenarioEvaluation extends ScenarioTipping {
  outlookId: string
  inputHash: string
  releaseRefs: OutlookReleaseRef[]
}

/** Measures with a height, as the key names them: heights above the site's datum. */
function datumHeights(measures: Measure[]): MeasureHeight[] {
  return measures.flatMap(m => m.height === null ? [] : [{ key: m.id, height: m.height, kind: m.kind }])
}

/** Names the measures' heights and the engine: the same key finds the same stored chances. */
export function measuresKey(measures: Measure[]) {
  return createHash('sha256').update(JSON.stringify([ENGINE_VERSION, datumHeights(measures)])).digest('hex')
}

function scenarioEvaluation(
  outlook: Pick<Outlook, 'id' | 'scenario' | 'inputHash' | 'releaseRefs'>,
  evaluation: Pick<Evaluation, 'horizon' | 'chances'>,
  tolerances: number[],
): ScenarioEvaluation {
  return {
    scenario: outlook.scenario,
    horizon: evaluation.horizon!,
    tipping: Object.fromEntries(tippingOf(evaluation.chances ?? [], tolerances).map(m => [m.key, m.tipping])),
    outlookId: outlook.id,
    inputHash: outlook.inputHash,
    releaseRefs: outlook.releaseRefs,
  }
}

/** The latest finished outlook of each scenario at a site, without its input or result. */
function latestOutlookHeads(executor: Pick<Tx, 'selectDistinctOn'>, siteId: string) {
  return executor
    .selectDistinctOn([outlooks.scenario], {
      id: outlooks.id,
      scenario: outlooks.scenario,
      inputHash: outlooks.inputHash,
      releaseRefs: outlooks.releaseRefs,
      horizon: sql<number>`(${outlooks.input}->'years'->>-1)::int`.mapWith(Number),
    })
    .from(outlooks)
    .where(and(eq(outlooks.siteId, siteId), eq(outlooks.state, 'done')))
    .orderBy(outlooks.scenario, desc(outlooks.finishedAt), desc(outlooks.id))
}

/** Asks for the measures' chances under each outlook that has none (a row and a job each), in the caller's tx. */
async function requestEvaluations(tx: Executor, siteId: string, outlookIds: string[], measures: Measure[]) {
  if (!outlookIds.length) return
  const measuresKeyed = measuresKey(measures)
  const requested = await tx
    .insert(tippingEvaluations)
    .values(outlookIds.map(outlookId => ({
      outlookId, siteId, measuresKey: measuresKeyed, heights: datumHeights(measures),
    })))
    .onConflictDoNothing()
    .returning({ id: tippingEvaluations.id })
  for (const row of requested) await enqueueJob(tx, 'tipping-evaluation', { evaluationId: row.id })
}

/**
 * After a site's measures change (added, edited, removed): queues the new measures' chances under
 * each scenario's latest outlook, in the transaction of the change, and drops those of the measures
 * as they were. Call `kickJobs()` after commit.
 */
export async function queueTippingEvaluations(tx: Tx, siteId: string) {
  const measures = await tx
    .select()
    .from(adaptationMeasures)
    .where(eq(adaptationMeasures.siteId, siteId))
  // Chances of measures as they were are never read again (records keep their own numbers).
  await tx
    .delete(tippingEvaluations)
    .where(and(eq(tippingEvaluations.siteId, siteId), ne(tippingEvaluations.measuresKey, measuresKey(measures))))
  const latest = await latestOutlookHeads(tx, siteId)
  await requestEvaluations(tx, siteId, latest.map(o => o.id), measures)
}

/** When an outlook finishes: its site's measures' chances under it, in the transaction that stores it. */
export async function queueOutlookTipping(tx: Tx, outlookId: string, siteId: string) {
  const measures = await tx.select().from(adaptationMeasures).where(eq(adaptationMeasures.siteId, siteId))
  if (datumHeights(measures).length) await requestEvaluations(tx, siteId, [outlookId], measures)
}

/**
 * Every scenario with a finished outlook for the site, in name order, with its stored tipping years;
 * `computing` names the scenarios whose tipping years for these measures are still being computed
 * (queued here when nothing was stored yet). Outlooks the engine could not evaluate are left out.
 */
export async function siteTipping(siteId: string, measures: Measure[], tolerances: number[]) {
  const db = await useDb()
  const latest = (await latestOutlookHeads(db, siteId)).sort((a, b) => a.scenario.localeCompare(b.scenario))
  if (!datumHeights(measures).length) {
    // Nothing to tip: no engine run needed.
    const scenarios = latest.map(o => scenarioEvaluation(o, { horizon: o.horizon, chances: [] }, tolerances))
    return { scenarios, computing: [] }
  }
  const key = measuresKey(measures)
  const stored = latest.length
    ? await db
        .select({
          outlookId: tippingEvaluations.outlookId,
          state: tippingEvaluations.state,
          horizon: tippingEvaluations.horizon,
          chances: tippingEvaluations.chances,
        })
        .from(tippingEvaluations)
        .where(and(
          inArray(tippingEvaluations.outlookId, latest.map(o => o.id)),
          eq(tippingEvaluations.measuresKey, key),
        ))
    : []
  const byOutlook = new Map(stored.map(row => [row.outlookId, row]))
  const missing = latest.filter(o => !byOutlook.has(o.id)).map(o => o.id)
  if (missing.length) {
    await db.transaction(tx => requestEvaluations(tx, siteId, missing, measures))
    kickJobs()
  }
  const scenarios: ScenarioEvaluation[] = []
  const computing: string[] = []
  for (const outlook of latest) {
    const row = byOutlook.get(outlook.id)
    if (row?.state === 'done') scenarios.push(scenarioEvaluation(outlook, row, tolerances))
    else if (row?.state !== 'failed') computing.push(outlook.scenario)
  }
  return { scenarios, computing }
}

/** The scenarios whose tipping years are stored (`siteTipping` also names those still being computed). */
export async function evaluateSite(siteId: string, measures: Measure[], tolerances: number[]) {
  return (await siteTipping(siteId, measures, tolerances)).scenarios
}

/** Runs the engine for the measures (heights above the datum) on the pool: each one's chance by year. */
async function computeChances(input: Outlook['input'], heights: MeasureHeight[]) {
  const offset = input.datum?.offset ?? 0
  // A flood level needs the outlook's extreme-water statistics; without them it never tips.
  const engineHeights = heights.flatMap(m => m.kind === 'flood-level' && !input.gumbel
    ? []
    : [{ ...m, height: m.height - offset }])
  if (!engineHeights.length) return { horizon: input.years.at(-1)!, measures: [] }
  return runPlanOffThread(measuresPlan(input, engineHeights), measureChances)
}

/** Computes and stores the chances of an evaluation row's measures; an outlook the engine refuses is marked failed. */
async function storeEvaluation(outlook: Outlook, measuresKeyed: string, heights: MeasureHeight[]) {
  const db = await useDb()
  let values: Partial<Evaluation>
  try {
    const { horizon, measures } = await computeChances(outlook.input, heights)
    values = { state: 'done', horizon, chances: measures, error: null, finishedAt: new Date() }
  }
  catch (error) {
    // An outlook stored under rules the engine no longer accepts is left out, not retried; the next
    // recomputation replaces it.
    if (!(error instanceof EngineInputError)) throw error
    console.error(`[brinkwater] pathways: outlook ${outlook.id} could not be evaluated:`, error.message)
    values = { state: 'failed', error: error.message, finishedAt: new Date() }
  }
  const [row] = await db
    .insert(tippingEvaluations)
    .values({ outlookId: outlook.id, siteId: outlook.siteId, measuresKey: measuresKeyed, heights, ...values })
    .onConflictDoUpdate({ target: [tippingEvaluations.outlookId, tippingEvaluations.measuresKey], set: values })
    .returning()
  return row!
}

/**
 * The measures' tipping years under one outlook, computed on the pool and stored first if they are not
 * stored yet (background work and records, which must not act on numbers still to come). Null when
 * the engine cannot evaluate the outlook.
 */
export async function ensureTipping(
  outlook: Outlook,
  measures: Measure[],
  tolerances: number[],
): Promise<ScenarioEvaluation | null> {
  const db = await useDb()
  const key = measuresKey(measures)
  let [row] = await db
    .select()
    .from(tippingEvaluations)
    .where(and(eq(tippingEvaluations.outlookId, outlook.id), eq(tippingEvaluations.measuresKey, key)))
  if (row?.state !== 'done' && row?.state !== 'failed') row = await storeEvaluation(outlook, key, datumHeights(measures))
  return row.state === 'done' ? scenarioEvaluation(outlook, row, tolerances) : null
}

/** The job queued by `requestEvaluations`: computes a requested evaluation unless it is already stored. */
export async function runTippingEvaluation(evaluationId: string) {
  const db = await useDb()
  const [row] = await db.select().from(tippingEvaluations).where(eq(tippingEvaluations.id, evaluationId))
  if (!row || row.state !== 'running') return
  const [outlook] = await db.select().from(outlooks).where(eq(outlooks.id, row.outlookId))
  if (outlook) await storeEvaluation(outlook, row.measuresKey, row.heights)
}
