import { eq, sql } from 'drizzle-orm'
import { outlooks, sites } from '~~/server/db/schema'
import type { CurrentUser } from '../utils/auth'
import { preparedQuery } from '../utils/prepared-query'
import { sharedReads } from '../utils/shared-reads'
import { publishedStorylines } from '../services/science-records'
import { newerScience } from './newer-science'
import { storylineBasis, storylineRise, type StorylineBasis } from '#shared/storylines/rise'
import type { BriefingStoryline } from '#shared/briefing/document'

type OutlookRow = typeof outlooks.$inferSelect

// A finished outlook never changes, so the latest ones read are kept in memory as the UTF-8 bytes of
// their stored fields: a room full of people opening the same outlook skips reading, parsing and
// re-serialising its 120 kB result, and every response sends the same bytes instead of a fresh copy
// (which, held while slow readers drain it, filled the heap under `npm run load`). Only what the live
// fields need of the row is kept beside them, not the parsed result. Running and failed outlooks, the
// site's own fields and the newer-science check are always read fresh.
interface Loaded {
  siteId: string
  scenario: string
  releaseRefs: OutlookRow['releaseRefs']
  progress: number | null
  /** What the published storylines need to be placed at this site (finished outlooks only). */
  storylineBasis: StorylineBasis | null
  /** The stored fields as JSON without the closing brace, ready for the live fields to follow. */
  head: Buffer
}
const finished = new Map<string, Loaded>()
const MAX_FINISHED = 50

/** What a reader sees of the stored row: which instance holds the lease is the server's business. */
function readerFields(row: OutlookRow) {
  const { claimedBy: _claimedBy, leaseUntil: _leaseUntil, attempts: _attempts, progress: _progress, ...rest } = row
  return rest
}

function loaded(row: OutlookRow): Loaded {
  const json = JSON.stringify(readerFields(row))
  return {
    siteId: row.siteId,
    scenario: row.scenario,
    releaseRefs: row.releaseRefs,
    progress: row.state === 'running' ? row.progress : null,
    storylineBasis: row.state === 'done' ? storylineBasis(row.input) : null,
    head: Buffer.from(json.slice(0, -1)),
  }
}

async function loadOutlook(id: string): Promise<Loaded | undefined> {
  const kept = finished.get(id)
  if (kept) return kept
  const db = await useDb()
  const [row] = await db.select().from(outlooks).where(eq(outlooks.id, id))
  if (!row) return undefined
  if (row.state !== 'done') return loaded(row)
  const fresh = loaded(row)
  finished.set(id, fresh)
  // A Map keeps insertion order: the first key is the oldest.
  if (finished.size > MAX_FINISHED) finished.delete(finished.keys().next().value!)
  return fresh
}

/** What a reader needs of an outlook's site: who owns it, and the fields shown beside the outlook. */
const siteQuery = preparedQuery(db => db.select({ name: sites.name, organisationId: sites.organisationId, referenceLevel: sites.referenceLevel })
  .from(sites).where(eq(sites.id, sql.placeholder('siteId'))).prepare('outlook_site'))
const siteOfOutlook = sharedReads(async (siteId: string) => {
  const [site] = await (await siteQuery()).execute({ siteId })
  return site
})

/** A crowd reading outlooks of one scenario shares one query for its storylines. */
const storylinesOfScenario = sharedReads(publishedStorylines)

/** A storyline as a briefing places it, with its id for the page's links. */
export interface OutlookStoryline extends BriefingStoryline { id: string }

/**
 * The scenario's published storylines placed at the outlook's site: read fresh on every request (a
 * storyline published later appears beside an outlook computed earlier), never part of the outlook.
 */
export async function storylinesAt(outlook: { scenario: string, storylineBasis: StorylineBasis | null }): Promise<OutlookStoryline[]> {
  if (!outlook.storylineBasis) return []
  const published = await storylinesOfScenario(outlook.scenario)
  return published.map(({ baselineYear, anchorYears, values, ...about }) => ({
    ...about,
    rises: storylineRise({ name: about.name, baselineYear, anchorYears, values }, outlook.storylineBasis!),
  }))
}

/**
 * The outlook as one JSON object in two pieces of UTF-8: its stored fields (shared by every reader of
 * a finished outlook), then its site's name, progress and whether newer science exists.
 */
export async function getOutlookBody(user: CurrentUser, id: string): Promise<[Buffer, Buffer]> {
  const outlook = await loadOutlook(id)
  const site = outlook && await siteOfOutlook(outlook.siteId)
  if (!outlook || !site || site.organisationId !== user.organisationId) throw createError({ statusCode: 404, message: 'No such outlook.' })
  const science = await newerScience(site.organisationId, outlook.scenario, outlook.releaseRefs)
  const live = JSON.stringify({
    siteName: site.name,
    referenceLevel: site.referenceLevel,
    progress: outlook.progress,
    newerScience: science.newer,
    offeredScience: science.offered,
    storylines: await storylinesAt(outlook),
  })
  // The stored object's closing brace was left off, so the live fields continue it (no key is in both).
  return [outlook.head, Buffer.from(`,${live.slice(1)}`)]
}
