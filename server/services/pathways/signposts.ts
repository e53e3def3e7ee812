import { createHash } from 'node:crypto'
import { desc, eq } from 'drizzle-orm'
import { gaugeRecords } from '~~/server/db/schema'
import { MAX_TRAJECTORIES } from '#shared/engine'
import { ENGINE_VERSION } from '#shared/engine/version'
import {
  DEFAULT_NOISE_SD_M,
  MIN_SIGNAL_YEARS,
  noiseFromFit,
  type SignpostDecision,
  type SignpostNoise,
  type Signposts,
} from '#shared/observations/signposts'
import type { CurrentUser } from '../../utils/auth'
import { latestOutlooks } from '../notify'
import { loadSite } from '../sites'
import { refuse } from './refuse'
import { signpostsOffThread } from './signposts-thread'
import { siteMeasures, sitePathways } from './store'

// Signposts for a decision in a pathway: how a signal read off the site's tide gauge would have fared
// across the trajectories of the scenario's latest outlook (shared/observations/signposts.ts). The
// trajectories are the outlook's own first samples, redrawn; with W1 at 20,000 redrawing and the
// signposts took 0.2–0.6 s on this machine at load 9–10, so they run on a worker thread
// (signposts-thread.ts), results are kept in memory by outlook input hash, decision, signal years and
// noise (the pending answer too, so a second reader waits for the first), and the page asks for them
// after it has loaded.

const CACHE_LIMIT = 100
const cache = new Map<string, Promise<Signposts>>()

export interface SignpostsRequest {
  pathway: string
  measure: string
  scenario?: string
  years?: number[]
  tolerance?: number
}

const notFound = (message: string): never => {
  throw createError({ statusCode: 404, message })
}

/** The noise of the site's latest fitted gauge record, or the default (stated as such). */
async function siteNoise(siteId: string): Promise<SignpostNoise> {
  const db = await useDb()
  const [latest] = await db
    .select({ fit: gaugeRecords.fit })
    .from(gaugeRecords)
    .where(eq(gaugeRecords.siteId, siteId))
    .orderBy(desc(gaugeRecords.version))
    .limit(1)
  return latest?.fit ? noiseFromFit(latest.fit) : { sd: DEFAULT_NOISE_SD_M, phi: 0, source: 'default' }
}

/** Three decades after the epoch (the first at least MIN_SIGNAL_YEARS after it), within the horizon. */
export function defaultSignalYears(epoch: number, horizon: number): number[] {
  const first = Math.ceil((epoch + MIN_SIGNAL_YEARS) / 10) * 10
  return [first, first + 10, first + 20].filter(year => year <= horizon)
}

export async function siteSignposts(user: CurrentUser, siteId: string, request: SignpostsRequest) {
  const site = await loadSite(user, siteId)
  const [pathways, measures] = await Promise.all([sitePathways(siteId), siteMeasures(siteId)])
  const pathway = pathways.find(p => p.id === request.pathway) ?? notFound('No such pathway at this site.')
  const step = pathway.measureIds.indexOf(request.measure)
  if (step < 0) refuse('measure', 'Choose a measure of this pathway.')
  if (step === pathway.measureIds.length - 1)
    refuse('measure', 'The last measure of a pathway has no next measure to decide on; choose an earlier one.')
  const measure = measures.find(m => m.id === request.measure)!
  const next = measures.find(m => m.id === pathway.measureIds[step + 1])!
  if (measure.height === null)
    refuse('measure', 'This measure has no height, so it never tips; choose one with a height.')
  const scenario = request.scenario ?? site.planningScenario
  const outlook = (await latestOutlooks(siteId)).find(o => o.scenario === scenario)
    ?? notFound(`No finished outlook of this site under ${scenario}: request one on the site's page first.`)
  const input = outlook.input
  const epoch = input.baselineYear
  const horizon = input.years.at(-1)!
  const years = request.years ?? defaultSignalYears(epoch, horizon)
  const outside = years.find(year => year < epoch + MIN_SIGNAL_YEARS || year > horizon)
  if (outside !== undefined || !years.length)
    refuse('years', `Give signal years from ${epoch + MIN_SIGNAL_YEARS} (${MIN_SIGNAL_YEARS} years of record after the epoch) to ${horizon}.`)
  const noise = await siteNoise(siteId)
  const tolerance = measure.kind === 'flood-level' ? (request.tolerance ?? pathway.tolerances[0]!) : null
  const gumbel = input.gumbel
  if (tolerance !== null && !gumbel)
    refuse('measure', `The ${scenario} outlook has no extreme-water statistics to tell when a flood level tips; add them to the site and request the outlook again.`)
  const decision: SignpostDecision = {
    height: measure.height! - (input.datum?.offset ?? 0),
    leadTimeYears: next.leadTimeYears,
    ...(tolerance !== null ? { flood: { location: gumbel!.location, scale: gumbel!.scale, tolerance } } : {}),
  }
  const key = createHash('sha256')
    .update(JSON.stringify([ENGINE_VERSION, outlook.inputHash, decision, years, noise]))
    .digest('hex')
  let pending = cache.get(key)
  if (!pending) {
    pending = signpostsOffThread({
      input, trajectories: Math.min(input.samples, MAX_TRAJECTORIES), decision, years, noise, seed: input.seed,
    })
    if (cache.size >= CACHE_LIMIT) cache.delete(cache.keys().next().value!)
    cache.set(key, pending)
    // A failed run is not kept: the next request tries again.
    pending.catch(() => cache.get(key) === pending && cache.delete(key))
  }
  const result = await pending
  return {
    scenario,
    outlookId: outlook.id,
    inputHash: outlook.inputHash,
    measure: { id: measure.id, name: measure.name, height: measure.height, kind: measure.kind, tolerance },
    next: { id: next.id, name: next.name, leadTimeYears: next.leadTimeYears },
    ...result,
  }
}

export type SiteSignposts = Awaited<ReturnType<typeof siteSignposts>>
