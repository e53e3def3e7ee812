import { randomBytes } from 'node:crypto'
import { and, desc, eq, inArray } from 'drizzle-orm'
import type { StoredOutlookInput } from '#shared/types/outlook'
import { briefings, organisations, outlooks, releases, sites, thresholds, users } from '~~/server/db/schema'
import { buildBriefingDocument, type BriefingDocument, type BriefingOutlook } from '#shared/briefing/document'
import { storylineBasis } from '#shared/storylines/rise'
import { storylinesAt } from '../outlooks/storylines'
import type { CreateBriefingInput, UpdateBriefingInput } from '#shared/schemas/briefings'
import type { CurrentUser } from '../utils/auth'
import { briefingPathwaySection, pathwayCounts } from './pathways/briefing-section'
import { endShareWatches } from './watches'
import { languageOf } from '#shared/wording/translate'

type Briefing = typeof briefings.$inferSelect

/** A 400 naming its field, with the issue for the form to place beside that field. */
const bad = (field: string, message: string) =>
  createError({ statusCode: 400, message: `${field}: ${message}`, data: { issues: [{ field, message }] } })

/** The outlooks a briefing uses, checked to belong to one site of the caller's organisation. */
async function loadOutlooks(user: CurrentUser, ids: string[]) {
  const db = await useDb()
  const rows = await db.select({ outlook: outlooks, organisationId: sites.organisationId })
    .from(outlooks).innerJoin(sites, eq(sites.id, outlooks.siteId)).where(inArray(outlooks.id, ids))
  const found = ids.map(
    id => rows.find(row => row.outlook.id === id && row.organisationId === user.organisationId)?.outlook,
  )
  if (found.some(row => !row)) throw createError({ statusCode: 404, message: 'No such outlook.' })
  const list = found as (typeof outlooks.$inferSelect)[]
  if (list.some(o => o.siteId !== list[0]!.siteId))
    throw bad('comparisonOutlookIds', 'Compare outlooks of the same site only.')
  if (list.some(o => o.state !== 'done'))
    throw createError({
      statusCode: 409,
      message: 'An outlook is still running or failed; issue the briefing once it is done.',
    })
  return list
}

async function checkSelection(user: CurrentUser, input: UpdateBriefingInput & { outlookId: string }) {
  const list = await loadOutlooks(user, [
    input.outlookId,
    ...input.comparisonOutlookIds.filter(id => id !== input.outlookId),
  ])
  const siteId = list[0]!.siteId
  const db = await useDb()
  const own = await db.select({ id: thresholds.id }).from(thresholds).where(eq(thresholds.siteId, siteId))
  const stray = input.thresholdIds.find(id => !own.some(t => t.id === id))
  if (stray) throw bad('thresholdIds', `${stray} is not a threshold of this site.`)
  // A finished outlook (loadOutlooks refuses any other) has its result.
  const years = list[0]!.result!.years
  const missing = input.years.find(year => !years.includes(year))
  if (missing !== undefined)
    throw bad('years', `${missing} is not a year of the outlook; choose from ${years.join(', ')}.`)
  if (input.includePathways && !(await pathwayCounts(siteId)).pathways)
    throw bad(
      'includePathways',
      'This site has no adaptation pathway to include; add one on the site\'s pathways page, or leave this out.',
    )
  return { siteId, outlookIds: list.map(o => o.id) }
}

function fields(input: UpdateBriefingInput) {
  return {
    title: input.title,
    audience: input.audience,
    localContext: input.localContext,
    language: input.language,
    units: input.units,
    thresholdIds: input.thresholdIds,
    years: [...input.years].sort((a, b) => a - b),
    includePathways: input.includePathways,
  }
}

export async function createBriefing(planner: CurrentUser, input: CreateBriefingInput) {
  const { siteId, outlookIds } = await checkSelection(planner, input)
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(briefings)
      .values({ ...fields(input), organisationId: planner.organisationId, siteId, outlookIds, createdBy: planner.id })
      .returning()
    await writeAudit(tx, planner, 'briefing.drafted', { type: 'briefing', id: row!.id }, { site: siteId })
    return row!
  })
}

/** A briefing of the caller's organisation; readers see issued ones only. */
export async function loadBriefing(user: CurrentUser, id: string): Promise<Briefing> {
  const db = await useDb()
  const [row] = await db
    .select()
    .from(briefings)
    .where(and(eq(briefings.id, id), eq(briefings.organisationId, user.organisationId)))
  if (!row || (row.state === 'draft' && user.role !== 'planner'))
    throw createError({ statusCode: 404, message: 'No such briefing.' })
  return row
}

export async function updateBriefing(
  planner: CurrentUser,
  id: string,
  input: UpdateBriefingInput & { outlookId?: string },
) {
  const row = await loadBriefing(planner, id)
  if (row.state !== 'draft')
    throw createError({
      statusCode: 409,
      message: `Version ${row.version} was issued on ${row.issuedAt!.toISOString().slice(0, 10)} and never changes; start a new version instead.`,
    })
  const { outlookIds } = await checkSelection(planner, { ...input, outlookId: input.outlookId ?? row.outlookIds[0]! })
  const db = await useDb()
  const [updated] = await db
    .update(briefings)
    .set({ ...fields(input), outlookIds, updatedAt: new Date() })
    .where(and(eq(briefings.id, id), eq(briefings.state, 'draft')))
    .returning()
  if (!updated)
    throw createError({
      statusCode: 409,
      message: 'This briefing was issued while you were editing it; start a new version instead.',
    })
  return updated
}

/** The datum an outlook's heights were computed with (outlooks stored before datums have none: the site's then). */
function primaryAssumptions(outlook: { input: StoredOutlookInput } | undefined) {
  const datum = outlook?.input.datum
  const draws = outlook?.input.landMotionDraws
  return {
    ...(datum
      ? {
          referenceLevel: datum.name,
          datumKind: datum.kind,
          datumOffset: datum.offset,
          referenceEpoch: datum.referenceEpoch,
        }
      : {}),
    // The land motion the primary outlook assumed, when it came from the site's draws.
    ...(draws ? { landMotionDraws: draws } : {}),
  }
}

/** The published storylines of the primary outlook's scenario, placed at its site. */
async function storylinesOfOutlook(
  outlook: { scenario: string, state: string, input: StoredOutlookInput } | undefined,
) {
  if (!outlook || outlook.state !== 'done') return []
  return storylinesAt({ scenario: outlook.scenario, storylineBasis: storylineBasis(outlook.input) })
}

/** The document as it reads now (drafts) or as it was frozen (issued). */
export async function briefingDocument(
  row: Briefing,
  issuedAt: Date | null = row.issuedAt,
  issuedBy: string | null = row.issuedBy,
): Promise<BriefingDocument> {
  if (row.document) return row.document
  const db = await useDb()
  const [site] = await db
    .select({ site: sites, illustrative: organisations.illustrative, organisation: organisations.name })
    .from(sites)
    .innerJoin(organisations, eq(organisations.id, sites.organisationId))
    .where(eq(sites.id, row.siteId))
  // The author is whoever issues it; until then, whoever drafted it.
  const authorId = issuedBy ?? row.createdBy
  const [author] = authorId ? await db.select({ name: users.name }).from(users).where(eq(users.id, authorId)) : []
  const chosen = await db.select().from(thresholds).where(inArray(thresholds.id, row.thresholdIds))
  const stored = await db.select().from(outlooks).where(inArray(outlooks.id, row.outlookIds))
  const refs = stored.flatMap(o => o.releaseRefs.map(r => r.releaseId))
  const states = refs.length
    ? await db.select({ id: releases.id, state: releases.state }).from(releases).where(inArray(releases.id, refs))
    : []
  const previous = row.previousId
    ? (await db.select({ version: briefings.version }).from(briefings).where(eq(briefings.id, row.previousId)))[0]
    : undefined
  const ordered: BriefingOutlook[] = row.outlookIds.map((id) => {
    const o = stored.find(s => s.id === id)!
    return {
      scenario: o.scenario,
      inputHash: o.inputHash,
      samples: o.samples,
      seed: o.seed,
      correlated: o.correlationSetId !== null,
      // A briefing is made of finished outlooks only (loadOutlooks), so each has its result.
      result: o.result!,
      releaseRefs: o.releaseRefs.map(r => ({
        ...r,
        state: states.find(s => s.id === r.releaseId)?.state ?? 'published',
      })),
    }
  })
  const document = buildBriefingDocument({
    language: languageOf(row.language),
    units: row.units === 'ft' ? 'ft' : 'm',
    title: row.title,
    audience: row.audience,
    localContext: row.localContext,
    version: row.version,
    previousVersion: previous?.version ?? null,
    issuedAt: issuedAt?.toISOString() ?? null,
    livePath: `/briefings/${row.id}`,
    illustrative: site!.illustrative,
    organisation: site!.organisation,
    author: author?.name ?? null,
    site: { ...site!.site, ...primaryAssumptions(stored.find(o => o.id === row.outlookIds[0])) },
    thresholds: row.thresholdIds.map(id => chosen.find(t => t.id === id)!).filter(Boolean),
    years: row.years,
    outlooks: ordered,
    storylines: await storylinesOfOutlook(stored.find(o => o.id === row.outlookIds[0])),
  })
  // Measures are heights above the site's datum as it is now, as on its pathways page.
  return row.includePathways ? { ...document, pathways: await briefingPathwaySection(site!.site, issuedAt) } : document
}

export async function issueBriefing(planner: CurrentUser, id: string) {
  const row = await loadBriefing(planner, id)
  if (row.state !== 'draft')
    throw createError({ statusCode: 409, message: `Version ${row.version} is already issued.` })
  const issuedAt = new Date()
  const document = await briefingDocument(row, issuedAt, planner.id)
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [issued] = await tx
      .update(briefings)
      .set({ state: 'issued', document, issuedAt, issuedBy: planner.id, updatedAt: issuedAt })
      .where(and(eq(briefings.id, id), eq(briefings.state, 'draft')))
      .returning()
    if (!issued) throw createError({ statusCode: 409, message: 'This briefing has just been issued by someone else.' })
    await writeAudit(
      tx,
      planner,
      'briefing.issued',
      { type: 'briefing', id },
      { version: row.version, site: row.siteId },
    )
    await enqueueJob(tx, 'briefing-issued', { briefingId: id })
    return issued
  }).then((issued) => {
    kickJobs()
    return issued
  })
}

/** The latest finished outlook of each of a briefing's scenarios, with the thresholds and years it can still state. */
async function latestSelection(row: Briefing) {
  const db = await useDb()
  const used = await db
    .select({ id: outlooks.id, scenario: outlooks.scenario })
    .from(outlooks)
    .where(inArray(outlooks.id, row.outlookIds))
  const scenarios = row.outlookIds
    .map(id => used.find(o => o.id === id)?.scenario)
    .filter((s): s is string => s !== undefined)
  const latest = await db
    .selectDistinctOn([outlooks.scenario], { id: outlooks.id, scenario: outlooks.scenario, result: outlooks.result })
    .from(outlooks)
    .where(and(eq(outlooks.siteId, row.siteId), eq(outlooks.state, 'done'), inArray(outlooks.scenario, scenarios)))
    .orderBy(outlooks.scenario, desc(outlooks.finishedAt))
  const ordered = scenarios.map(scenario => latest.find(o => o.scenario === scenario)!).filter(Boolean)
  const own = new Set(
    (await db.select({ id: thresholds.id }).from(thresholds).where(eq(thresholds.siteId, row.siteId))).map(t => t.id),
  )
  const years = new Set(ordered[0]?.result?.years ?? [])
  return {
    outlookIds: ordered.map(o => o.id),
    // A threshold removed from the site, or a year the new outlook does not give, is left out of the draft.
    thresholdIds: row.thresholdIds.filter(id => own.has(id)),
    years: row.years.filter(year => years.has(year)),
  }
}

/**
 * A new draft that starts from an issued briefing and replaces it once issued: with the same
 * outlooks, or (fromLatestOutlooks) with the latest finished outlook of each of its scenarios.
 */
export async function newBriefingVersion(
  planner: CurrentUser,
  id: string,
  options: { fromLatestOutlooks?: boolean } = {},
) {
  const row = await loadBriefing(planner, id)
  if (row.state !== 'issued')
    throw createError({
      statusCode: 409,
      message: 'Only an issued briefing gets a new version; edit this draft instead.',
    })
  const selection = options.fromLatestOutlooks
    ? await latestSelection(row)
    : { outlookIds: row.outlookIds, thresholdIds: row.thresholdIds, years: row.years }
  if (!selection.outlookIds.length || !selection.thresholdIds.length || !selection.years.length) {
    throw createError({
      statusCode: 409,
      message:
        'The latest outlooks no longer cover this briefing\'s thresholds or years; start a new briefing from the site instead.',
    })
  }
  const db = await useDb()
  const [latest] = await db
    .select({ version: briefings.version })
    .from(briefings)
    .where(eq(briefings.siteId, row.siteId))
    .orderBy(desc(briefings.version))
    .limit(1)
  const [draft] = await db
    .insert(briefings)
    .values({
      organisationId: row.organisationId,
      siteId: row.siteId,
      outlookIds: selection.outlookIds,
      version: Math.max(row.version, latest?.version ?? 0) + 1,
      previousId: row.id,
      title: row.title,
      audience: row.audience,
      localContext: row.localContext,
      language: row.language,
      units: row.units,
      thresholdIds: selection.thresholdIds,
      years: selection.years,
      includePathways: row.includePathways,
      createdBy: planner.id,
    })
    .returning()
  await writeAudit(
    db,
    planner,
    'briefing.new-version',
    { type: 'briefing', id: draft!.id },
    { previous: id, fromLatestOutlooks: options.fromLatestOutlooks === true },
  )
  return draft!
}

export async function setSharing(planner: CurrentUser, id: string, shared: boolean) {
  const row = await loadBriefing(planner, id)
  if (shared && row.state !== 'issued')
    throw createError({
      statusCode: 409,
      message: 'Issue the briefing before sharing it: drafts stay inside the organisation.',
    })
  const token = shared ? (row.shareToken ?? randomBytes(24).toString('base64url')) : null
  const db = await useDb()
  await db.transaction(async (tx) => {
    await tx.update(briefings).set({ shareToken: token, updatedAt: new Date() }).where(eq(briefings.id, id))
    // Watches started from the link end with it, each told so once.
    if (!shared) await endShareWatches(tx, row)
    await writeAudit(tx, planner, shared ? 'briefing.shared' : 'briefing.unshared', { type: 'briefing', id })
  })
  // The page cache drops the revoked link's pages now, rather than at its next check.
  if (!shared && row.shareToken) forgetSharedPages(row.shareToken)
  return { shareToken: token }
}

export async function sharedBriefing(token: string) {
  const db = await useDb()
  const [row] = await db
    .select()
    .from(briefings)
    .where(and(eq(briefings.shareToken, token), eq(briefings.state, 'issued')))
  if (!row)
    throw createError({
      statusCode: 404,
      message: 'This link does not open a briefing: it may have been withdrawn by its author.',
    })
  return row
}

export async function listBriefings(user: CurrentUser, siteId?: string) {
  const db = await useDb()
  const conditions = [eq(briefings.organisationId, user.organisationId)]
  if (siteId) conditions.push(eq(briefings.siteId, siteId))
  if (user.role !== 'planner') conditions.push(eq(briefings.state, 'issued'))
  const rows = await db
    .select({
      id: briefings.id,
      title: briefings.title,
      version: briefings.version,
      state: briefings.state,
      siteId: briefings.siteId,
      siteName: sites.name,
      language: briefings.language,
      issuedAt: briefings.issuedAt,
      shareToken: briefings.shareToken,
      previousId: briefings.previousId,
      updatedAt: briefings.updatedAt,
    })
    .from(briefings)
    .innerJoin(sites, eq(sites.id, briefings.siteId))
    .where(and(...conditions))
    .orderBy(desc(briefings.updatedAt))
  // Lists say whether a briefing is shared; only its page shows the link itself, to planners.
  return rows.map(({ shareToken, ...row }) => ({ ...row, shared: shareToken !== null }))
}

/**
 * The "live page" a briefing points its reader to: the share link once it is shared (planners, who
 * hand it on), else the page inside the organisation, which needs a sign-in and says so. Readers
 * never get the share link: only planners decide who holds it.
 */
export function liveLink(
  row: Pick<Briefing, 'id' | 'shareToken'>,
  user: CurrentUser | null,
): { path: string, signIn: boolean } {
  if (row.shareToken && (user === null || user.role === 'planner'))
    return { path: `/shared/${row.shareToken}`, signIn: false }
  return { path: `/briefings/${row.id}`, signIn: true }
}
