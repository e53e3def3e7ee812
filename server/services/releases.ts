import { and, desc, eq, inArray, max, or, type SQL } from 'drizzle-orm'
import { alias, type AnyPgColumn } from 'drizzle-orm/pg-core'
import { organisations, releaseDraws, releases, series, users } from '~~/server/db/schema'
import { splitRelease } from '#shared/releases/parameters'
import type { CreateReleaseInput, ReleaseContentInput } from '#shared/schemas/releases'
import { judgeEdit } from '#shared/review/rules'
import { PUBLIC_STATES, type ReviewState } from '#shared/types/science'
import type { CurrentUser } from '../utils/auth'

type Viewer = CurrentUser | null

/** Published-once records are public; drafts and reviews only within their organisation. */
export function visibleTo(
  viewer: Viewer,
  organisationColumn: AnyPgColumn = releases.organisationId,
  stateColumn: AnyPgColumn = releases.state,
): SQL {
  const open = inArray(stateColumn, [...PUBLIC_STATES])
  return viewer ? or(open, eq(organisationColumn, viewer.organisationId))! : open
}

function encodeDraws(draws: number[][]): Buffer {
  const anchors = draws[0]?.length ?? 0
  const flat = new Float64Array(draws.length * anchors)
  draws.forEach((draw, d) => flat.set(draw, d * anchors))
  return Buffer.from(flat.buffer)
}

export function decodeDraws(values: Buffer, drawCount: number, anchorCount: number): number[][] {
  const flat = new Float64Array(values.buffer.slice(values.byteOffset, values.byteOffset + values.byteLength))
  return Array.from({ length: drawCount }, (_, d) => Array.from(flat.subarray(d * anchorCount, (d + 1) * anchorCount)))
}

/**
 * A release as entered → the row's distribution columns, its bands and its draws (if any), worked off the request
 * thread.
 */
async function prepare(input: ReleaseContentInput) {
  const { release, bands: summary } = await releaseWork({ input, years: 'anchors' })
  const { parameters, draws } = splitRelease(release)
  return {
    columns: {
      form: release.form,
      baselineYear: release.baselineYear,
      anchorYears: release.anchorYears,
      parameters,
      enteredUnit: input.unit,
      summary,
    },
    draws,
  }
}

async function seriesFor(actor: CurrentUser, input: CreateReleaseInput) {
  const db = await useDb()
  if (input.seriesId) {
    const [row] = await db
      .select()
      .from(series)
      .where(and(eq(series.id, input.seriesId), eq(series.organisationId, actor.organisationId)))
    if (!row) throw createError({ statusCode: 404, message: 'No such series in your organisation.' })
    return row
  }
  const wanted = input.series!
  const [clash] = await db.select({ id: series.id }).from(series).where(and(
    eq(series.organisationId, actor.organisationId), eq(series.component, wanted.component),
    eq(series.scenario, wanted.scenario), eq(series.title, wanted.title)))
  if (clash)
    throw createError({
      statusCode: 409,
      message: `series: "${wanted.title}" already exists for ${wanted.component} under ${wanted.scenario}; add a new version to it instead.`,
      data: { seriesId: clash.id },
    })
  return null
}

async function nextVersion(seriesId: string | undefined, requested: number | undefined) {
  const db = await useDb()
  let next = 1
  if (seriesId) {
    const open = await db.select({ version: releases.version, state: releases.state }).from(releases)
      .where(and(eq(releases.seriesId, seriesId), inArray(releases.state, ['draft', 'in-review'])))
    if (open[0])
      throw createError({
        statusCode: 409,
        message: `Version ${open[0].version} of this series is still ${open[0].state === 'draft' ? 'a draft' : 'in review'}; finish it before starting another.`,
      })
    const [row] = await db.select({ top: max(releases.version) }).from(releases).where(eq(releases.seriesId, seriesId))
    next = (row?.top ?? 0) + 1
  }
  if (requested !== undefined && requested !== next) {
    throw createError({
      statusCode: 400,
      message:
        requested < next
          ? `version: Version ${requested} already exists in this series; the next version is ${next}.`
          : `version: The next version of this series is ${next}, not ${requested}.`,
    })
  }
  return next
}

export async function createRelease(actor: CurrentUser, input: CreateReleaseInput) {
  const existing = await seriesFor(actor, input)
  const version = await nextVersion(existing?.id, input.version)
  const { columns, draws } = await prepare(input)
  const db = await useDb()
  return db.transaction(async (tx) => {
    const seriesRow
      = existing
        ?? (
          await tx
            .insert(series)
            .values({ ...input.series!, organisationId: actor.organisationId })
            .returning()
        )[0]!
    const [created] = await tx.insert(releases).values({
      ...columns,
      seriesId: seriesRow.id,
      organisationId: actor.organisationId,
      version,
      method: input.method,
      citation: input.citation,
      doi: input.doi ?? null,
      licence: input.licence,
      authorId: actor.id,
    }).returning({ id: releases.id, version: releases.version, state: releases.state, seriesId: releases.seriesId })
    if (draws)
      await tx
        .insert(releaseDraws)
        .values({
          releaseId: created!.id,
          drawCount: draws.length,
          anchorCount: columns.anchorYears.length,
          values: encodeDraws(draws),
        })
    await writeAudit(
      tx,
      actor,
      'release.drafted',
      { type: 'release', id: created!.id },
      { series: seriesRow.id, version },
    )
    return created!
  }).catch((error) => {
    if (isUniqueViolation(error))
      throw createError({
        statusCode: 409,
        message: `Someone started version ${version} of this series at the same moment. Open the series to see it before starting another.`,
      })
    throw error
  })
}

export async function updateRelease(
  actor: CurrentUser,
  id: string,
  input: ReleaseContentInput & { method: string, citation: string, doi?: string, licence: string },
) {
  const db = await useDb()
  const [row] = await db
    .select()
    .from(releases)
    .where(and(eq(releases.id, id), eq(releases.organisationId, actor.organisationId)))
  if (!row) throw createError({ statusCode: 404, message: 'No such release.' })
  const verdict = judgeEdit(row, actor)
  if (!verdict.ok) throw createError({ statusCode: verdict.status, message: verdict.message })
  const { columns, draws } = await prepare(input)
  return db.transaction(async (tx) => {
    // Re-check under a lock: a submit may have raced this edit.
    const [locked] = await tx
      .select({ state: releases.state, coauthorIds: releases.coauthorIds })
      .from(releases)
      .where(eq(releases.id, id))
      .for('update')
    if (locked?.state !== 'draft')
      throw createError({
        statusCode: 409,
        message: 'This version left the draft state while you were editing; start a new version instead.',
      })
    // Whoever changes a colleague's draft becomes one of its authors, so they cannot approve it later.
    const coauthorIds
      = actor.id === row.authorId || locked.coauthorIds.includes(actor.id)
        ? locked.coauthorIds
        : [...locked.coauthorIds, actor.id]
    const [updated] = await tx
      .update(releases)
      .set({
        ...columns,
        coauthorIds,
        method: input.method,
        citation: input.citation,
        doi: input.doi ?? null,
        licence: input.licence,
        updatedAt: new Date(),
      })
      .where(eq(releases.id, id))
      .returning({ id: releases.id, version: releases.version, state: releases.state })
    await tx.delete(releaseDraws).where(eq(releaseDraws.releaseId, id))
    if (draws)
      await tx.insert(releaseDraws).values({
        releaseId: id,
        drawCount: draws.length,
        anchorCount: columns.anchorYears.length,
        values: encodeDraws(draws),
      })
    await writeAudit(tx, actor, 'release.edited', { type: 'release', id }, { version: row.version })
    return updated!
  })
}

const author = alias(users, 'author')
const reviewer = alias(users, 'reviewer')

const listColumns = {
  id: releases.id,
  version: releases.version,
  state: releases.state,
  form: releases.form,
  baselineYear: releases.baselineYear,
  anchorYears: releases.anchorYears,
  summary: releases.summary,
  citation: releases.citation,
  withdrawalReason: releases.withdrawalReason,
  publishedAt: releases.publishedAt,
  updatedAt: releases.updatedAt,
  authorId: releases.authorId,
  coauthorIds: releases.coauthorIds,
  seriesId: series.id,
  component: series.component,
  scenario: series.scenario,
  title: series.title,
  organisationId: organisations.id,
  organisationName: organisations.name,
  illustrative: organisations.illustrative,
  authorName: author.name,
}

/**
 * Releases this person may see. Without a state filter anonymous callers get the published
 * versions only, unless they ask for a series' history (which includes superseded and withdrawn).
 */
export async function listReleases(
  viewer: Viewer,
  filter: { component?: string, scenario?: string, state?: ReviewState, organisationId?: string, seriesId?: string },
) {
  const db = await useDb()
  const conditions = [visibleTo(viewer)]
  if (!filter.state && !viewer && !filter.seriesId) conditions.push(eq(releases.state, 'published'))
  if (filter.state) conditions.push(eq(releases.state, filter.state))
  if (filter.component) conditions.push(eq(series.component, filter.component))
  if (filter.scenario) conditions.push(eq(series.scenario, filter.scenario))
  if (filter.organisationId) conditions.push(eq(series.organisationId, filter.organisationId))
  if (filter.seriesId) conditions.push(eq(series.id, filter.seriesId))
  return db
    .select(listColumns)
    .from(releases)
    .innerJoin(series, eq(series.id, releases.seriesId))
    .innerJoin(organisations, eq(organisations.id, releases.organisationId))
    .innerJoin(author, eq(author.id, releases.authorId))
    .where(and(...conditions))
    .orderBy(series.component, series.scenario, series.title, desc(releases.version))
}

export async function getRelease(viewer: Viewer, id: string) {
  const db = await useDb()
  const [row] = await db.select({
    ...listColumns,
    parameters: releases.parameters,
    enteredUnit: releases.enteredUnit,
    method: releases.method,
    doi: releases.doi,
    licence: releases.licence,
    reviewNote: releases.reviewNote,
    createdAt: releases.createdAt,
    submittedAt: releases.submittedAt,
    supersededAt: releases.supersededAt,
    withdrawnAt: releases.withdrawnAt,
    reviewerName: reviewer.name,
  }).from(releases)
    .innerJoin(series, eq(series.id, releases.seriesId))
    .innerJoin(organisations, eq(organisations.id, releases.organisationId))
    .innerJoin(author, eq(author.id, releases.authorId))
    .leftJoin(reviewer, eq(reviewer.id, releases.reviewerId))
    .where(and(eq(releases.id, id), visibleTo(viewer)))
  if (!row) throw createError({ statusCode: 404, message: 'No such release.' })
  let draws: number[][] | undefined
  if (row.form === 'samples') {
    const [stored] = await db.select().from(releaseDraws).where(eq(releaseDraws.releaseId, id))
    if (stored) draws = decodeDraws(stored.values, stored.drawCount, stored.anchorCount)
  }
  const distribution = {
    form: row.form,
    baselineYear: row.baselineYear,
    anchorYears: row.anchorYears,
    ...row.parameters,
    ...(draws ? { draws } : {}),
  }
  return { ...row, distribution }
}
