import { and, desc, eq, inArray, max, type SQL } from 'drizzle-orm'
import { visibleTo } from './releases'
import { correlationSets, organisations, scaleFactorGrids, storylines } from '~~/server/db/schema'
import { validateCorrelationMatrix } from '#shared/engine'
import { gridErrors, gridWarnings, parseGridCsv, type ScaleFactorGrid } from '#shared/releases/grid'
import type {
  CreateCorrelationSetInput,
  CreateScaleFactorGridInput,
  CreateStorylineInput,
} from '#shared/schemas/releases'
import type { CurrentUser } from '../utils/auth'
import { KIND_LABEL, type ReviewedKind } from './review'
import { publishedSeries } from './adoptions'

// Correlation sets, scale-factor grids and storylines: versioned and reviewed like releases, one series
// per scenario (correlation), per component (grids) or per scenario and name (storylines) within an
// organisation.

type Table = typeof correlationSets | typeof scaleFactorGrids | typeof storylines

async function nextVersion(table: Table, sameSeries: SQL, requested: number | undefined, kind: ReviewedKind) {
  const db = await useDb()
  const [open] = await db
    .select({ version: table.version })
    .from(table)
    .where(and(sameSeries, inArray(table.state, ['draft', 'in-review'])))
  if (open)
    throw createError({
      statusCode: 409,
      message: `Version ${open.version} of this ${KIND_LABEL[kind]} is not yet published; finish it before starting another.`,
    })
  const [row] = await db.select({ top: max(table.version) }).from(table).where(sameSeries)
  const next = (row?.top ?? 0) + 1
  if (requested !== undefined && requested !== next) {
    throw createError({
      statusCode: 400,
      message: `version: Version ${requested} ${requested < next ? 'already exists' : 'is not next'}; the next version is ${next}.`,
    })
  }
  return next
}

/** Two people starting the same version at once: the second hears so (the version is unique). */
function sameMoment(error: unknown, version: number, kind: ReviewedKind): never {
  if (isUniqueViolation(error))
    throw createError({
      statusCode: 409,
      message: `Someone started version ${version} of this ${KIND_LABEL[kind]} at the same moment. Reload to see it before starting another.`,
    })
  throw error
}

const provenance = (input: { method: string, citation: string, doi?: string, licence: string }) =>
  ({ method: input.method, citation: input.citation, doi: input.doi ?? null, licence: input.licence })

/**
 * The series each component of a correlation set was made for: as named, or the one published series
 * of the component under the scenario (the analyst's organisation's first). A component with none
 * published is tied to no series; one with several must be named.
 */
async function madeForSeries(actor: CurrentUser, input: CreateCorrelationSetInput) {
  const published = await publishedSeries(input.scenario)
  const named: Record<string, string> = {}
  const issues: Array<{ field: string, message: string }> = []
  for (const component of Object.keys(input.series ?? {})) {
    if (!input.components.includes(component as never))
      issues.push({
        field: `series.${component}`,
        message: `${component} is not among the set's components; remove it or add the component.`,
      })
  }
  for (const component of input.components) {
    const offers = published.filter(row => row.component === component)
    const id = input.series?.[component]
    if (id) {
      if (offers.some(row => row.seriesId === id)) named[component] = id
      else
        issues.push({
          field: `series.${component}`,
          message: `No published series of ${component} under ${input.scenario} has this id; choose one from the list.`,
        })
      continue
    }
    const own = offers.filter(row => row.organisationId === actor.organisationId)
    const pick = own.length === 1 ? own[0] : own.length === 0 && offers.length === 1 ? offers[0] : undefined
    if (pick) named[component] = pick.seriesId
    else if (offers.length)
      issues.push({
        field: `series.${component}`,
        message: `Several series of ${component} are published under ${input.scenario}; name the one this set was made for.`,
      })
  }
  if (issues.length)
    throw createError({
      statusCode: 400,
      message: issues.map(i => `${i.field}: ${i.message}`).join(' '),
      data: { issues },
    })
  return named
}

export async function createCorrelationSet(actor: CurrentUser, input: CreateCorrelationSetInput) {
  asBadRequest(() => validateCorrelationMatrix(input.matrix, input.components, 'matrix'))
  const madeFor = await madeForSeries(actor, input)
  const version = await nextVersion(
    correlationSets,
    and(eq(correlationSets.organisationId, actor.organisationId), eq(correlationSets.scenario, input.scenario))!,
    input.version,
    'correlation-set',
  )
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [created] = await tx
      .insert(correlationSets)
      .values({
        scenario: input.scenario,
        title: input.title,
        components: input.components,
        matrix: input.matrix,
        madeForSeries: madeFor,
        ...provenance(input),
        organisationId: actor.organisationId,
        version,
        authorId: actor.id,
      })
      .returning({ id: correlationSets.id, version: correlationSets.version, state: correlationSets.state })
    await writeAudit(tx, actor, 'correlation-set.drafted', { type: 'correlation-set', id: created!.id }, { version })
    return created!
  }).catch(error => sameMoment(error, version, 'correlation-set'))
}

function gridFrom(input: CreateScaleFactorGridInput): ScaleFactorGrid {
  if (input.csv !== undefined) return asBadRequest(() => parseGridCsv(input.csv!))
  if (!input.latitudes || !input.longitudes || !input.factors) {
    throw createError({ statusCode: 400, message: 'csv: Send a CSV table, or latitudes, longitudes and factors.' })
  }
  return { latitudes: input.latitudes, longitudes: input.longitudes, factors: input.factors }
}

export async function createScaleFactorGrid(actor: CurrentUser, input: CreateScaleFactorGridInput) {
  const grid = gridFrom(input)
  const errors = gridErrors(grid)
  if (errors.length)
    throw createError({
      statusCode: 400,
      message: errors
        .slice(0, 10)
        .map(e => `${e.field}: ${e.message}`)
        .join(' '),
      data: { issues: errors },
    })
  const version = await nextVersion(
    scaleFactorGrids,
    and(eq(scaleFactorGrids.organisationId, actor.organisationId), eq(scaleFactorGrids.component, input.component))!,
    input.version,
    'scale-factor-grid',
  )
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [created] = await tx.insert(scaleFactorGrids).values({
      component: input.component, title: input.title, ...grid,
      ...provenance(input), organisationId: actor.organisationId, version, authorId: actor.id,
    }).returning({ id: scaleFactorGrids.id, version: scaleFactorGrids.version, state: scaleFactorGrids.state })
    await writeAudit(
      tx,
      actor,
      'scale-factor-grid.drafted',
      { type: 'scale-factor-grid', id: created!.id },
      { version },
    )
    return { ...created!, warnings: gridWarnings(grid) }
  }).catch(error => sameMoment(error, version, 'scale-factor-grid'))
}

function visible(table: Table, viewer: CurrentUser | null) {
  return visibleTo(viewer, table.organisationId, table.state)
}

export async function listCorrelationSets(viewer: CurrentUser | null) {
  const db = await useDb()
  return db
    .select({
      id: correlationSets.id,
      scenario: correlationSets.scenario,
      title: correlationSets.title,
      version: correlationSets.version,
      state: correlationSets.state,
      components: correlationSets.components,
      authorId: correlationSets.authorId,
      organisationId: correlationSets.organisationId,
      organisationName: organisations.name,
      withdrawalReason: correlationSets.withdrawalReason,
    })
    .from(correlationSets)
    .innerJoin(organisations, eq(organisations.id, correlationSets.organisationId))
    .where(visible(correlationSets, viewer))
    .orderBy(correlationSets.scenario, desc(correlationSets.version))
}

export async function getCorrelationSet(viewer: CurrentUser | null, id: string) {
  const db = await useDb()
  const [row] = await db
    .select()
    .from(correlationSets)
    .where(and(eq(correlationSets.id, id), visible(correlationSets, viewer)))
  if (!row) throw createError({ statusCode: 404, message: 'No such correlation set.' })
  return row
}

export async function listScaleFactorGrids(viewer: CurrentUser | null) {
  const db = await useDb()
  return db
    .select({
      id: scaleFactorGrids.id,
      component: scaleFactorGrids.component,
      title: scaleFactorGrids.title,
      version: scaleFactorGrids.version,
      state: scaleFactorGrids.state,
      authorId: scaleFactorGrids.authorId,
      organisationId: scaleFactorGrids.organisationId,
      organisationName: organisations.name,
      withdrawalReason: scaleFactorGrids.withdrawalReason,
    })
    .from(scaleFactorGrids)
    .innerJoin(organisations, eq(organisations.id, scaleFactorGrids.organisationId))
    .where(visible(scaleFactorGrids, viewer))
    .orderBy(scaleFactorGrids.component, desc(scaleFactorGrids.version))
}

export async function getScaleFactorGrid(viewer: CurrentUser | null, id: string) {
  const db = await useDb()
  const [row] = await db
    .select()
    .from(scaleFactorGrids)
    .where(and(eq(scaleFactorGrids.id, id), visible(scaleFactorGrids, viewer)))
  if (!row) throw createError({ statusCode: 404, message: 'No such scale-factor grid.' })
  return { ...row, warnings: gridWarnings(row) }
}

export async function createStoryline(actor: CurrentUser, input: CreateStorylineInput) {
  const version = await nextVersion(
    storylines,
    and(
      eq(storylines.organisationId, actor.organisationId),
      eq(storylines.scenario, input.scenario),
      eq(storylines.name, input.name),
    )!,
    input.version,
    'storyline',
  )
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [created] = await tx.insert(storylines).values({
      scenario: input.scenario, name: input.name, description: input.description, baselineYear: input.baselineYear,
      anchorYears: input.anchorYears, values: input.values as Record<string, number[]>,
      ...provenance(input), organisationId: actor.organisationId, version, authorId: actor.id,
    }).returning({ id: storylines.id, version: storylines.version, state: storylines.state })
    await writeAudit(tx, actor, 'storyline.drafted', { type: 'storyline', id: created!.id }, { version })
    return created!
  }).catch(error => sameMoment(error, version, 'storyline'))
}

export async function listStorylines(viewer: CurrentUser | null) {
  const db = await useDb()
  return db
    .select({
      id: storylines.id,
      scenario: storylines.scenario,
      name: storylines.name,
      version: storylines.version,
      state: storylines.state,
      authorId: storylines.authorId,
      organisationId: storylines.organisationId,
      organisationName: organisations.name,
      withdrawalReason: storylines.withdrawalReason,
    })
    .from(storylines)
    .innerJoin(organisations, eq(organisations.id, storylines.organisationId))
    .where(visible(storylines, viewer))
    .orderBy(storylines.scenario, storylines.name, desc(storylines.version))
}

export async function getStoryline(viewer: CurrentUser | null, id: string) {
  const db = await useDb()
  const [row] = await db.select().from(storylines).where(and(eq(storylines.id, id), visible(storylines, viewer)))
  if (!row) throw createError({ statusCode: 404, message: 'No such storyline.' })
  return row
}

/** The published storylines of a scenario, from every organisation: shown beside its outlooks. */
export async function publishedStorylines(scenario: string) {
  const db = await useDb()
  return db
    .select({
      id: storylines.id,
      name: storylines.name,
      description: storylines.description,
      version: storylines.version,
      citation: storylines.citation,
      baselineYear: storylines.baselineYear,
      anchorYears: storylines.anchorYears,
      values: storylines.values,
      organisationName: organisations.name,
      illustrative: organisations.illustrative,
    })
    .from(storylines)
    .innerJoin(organisations, eq(organisations.id, storylines.organisationId))
    .where(and(eq(storylines.scenario, scenario), eq(storylines.state, 'published')))
    .orderBy(storylines.name)
}
