import { and, asc, eq, inArray, sql } from 'drizzle-orm'
import {
  correlationAdoptions,
  correlationSets,
  organisations,
  releases,
  series,
  seriesAdoptions,
  users,
} from '~~/server/db/schema'
import type { AdoptionInput } from '#shared/schemas/adoptions'
import { COMPONENTS } from '#shared/types/science'
import type { CurrentUser } from '../utils/auth'
import { forgetRecentReads, recentReads } from '../utils/recent-reads'

// The science an organisation adopted for its outlooks: per scenario, one series of releases per
// component and whose correlation sets (or none). New versions in an adopted series flow in; any
// other published series is offered and never applied until someone adopts it.
//
// Default: an organisation that has adopted nothing for a scenario adopts, at its first outlook of
// that scenario, the first published series of every component (earliest first publication) and
// the first published correlation sets (or none when there are none). It happens only when every
// component has a published series, so an incomplete scenario adopts nothing. Organisations that
// had outlooks before adoption existed adopted what their latest outlooks used (the migration).

/** Every series of a scenario with a published version, oldest first publication first. */
export async function publishedSeries(scenario: string) {
  const db = await useDb()
  return db
    .select({
      seriesId: series.id,
      component: series.component,
      title: series.title,
      organisationId: series.organisationId,
      organisationName: organisations.name,
      releaseId: releases.id,
      version: releases.version,
      anchorYears: releases.anchorYears,
    })
    .from(releases)
    .innerJoin(series, eq(series.id, releases.seriesId))
    .innerJoin(organisations, eq(organisations.id, series.organisationId))
    .where(and(eq(series.scenario, scenario), eq(releases.state, 'published')))
    .orderBy(
      sql`(select min(earliest.published_at) from releases earliest where earliest.series_id = ${series.id})`,
      asc(series.createdAt),
      asc(series.id),
    )
}
export type PublishedSeries = Awaited<ReturnType<typeof publishedSeries>>[number]

/** Published correlation sets of a scenario (one per publishing organisation), oldest series first. */
export async function publishedCorrelationSets(scenario: string) {
  const db = await useDb()
  return db
    .select({
      id: correlationSets.id,
      organisationId: correlationSets.organisationId,
      organisationName: organisations.name,
      title: correlationSets.title,
      version: correlationSets.version,
      components: correlationSets.components,
      madeForSeries: correlationSets.madeForSeries,
    })
    .from(correlationSets)
    .innerJoin(organisations, eq(organisations.id, correlationSets.organisationId))
    .where(and(eq(correlationSets.scenario, scenario), eq(correlationSets.state, 'published')))
    .orderBy(
      sql`(select min(earliest.published_at) from correlation_sets earliest where earliest.organisation_id = ${correlationSets.organisationId} and earliest.scenario = ${correlationSets.scenario})`,
      asc(correlationSets.organisationId),
    )
}

/**
 * What an organisation adopted for a scenario: component → series id, and the correlation choice (undefined: none
 * made).
 */
export async function adoptionOf(organisationId: string, scenario: string) {
  const db = await useDb()
  const [rows, [correlation]] = await Promise.all([
    db
      .select({
        component: seriesAdoptions.component,
        seriesId: seriesAdoptions.seriesId,
        adoptedBy: seriesAdoptions.adoptedBy,
        adoptedAt: seriesAdoptions.adoptedAt,
      })
      .from(seriesAdoptions)
      .where(and(eq(seriesAdoptions.organisationId, organisationId), eq(seriesAdoptions.scenario, scenario))),
    db
      .select({
        source: correlationAdoptions.sourceOrganisationId,
        adoptedBy: correlationAdoptions.adoptedBy,
        adoptedAt: correlationAdoptions.adoptedAt,
      })
      .from(correlationAdoptions)
      .where(and(eq(correlationAdoptions.organisationId, organisationId), eq(correlationAdoptions.scenario, scenario))),
  ])
  return { series: new Map(rows.map(row => [row.component, row])), correlation }
}

/**
 * The same with the scenario's published series, for the outlook status that a crowd polls: read once
 * every RECENT_READ_MS (key: organisation id and scenario); a publication or an adoption through this
 * instance is seen at once (server/utils/recent-reads.ts).
 */
export const adoptedForReading = recentReads(async (key: string) => {
  const [organisationId, scenario] = key.split('\n') as [string, string]
  const [adoption, published] = await Promise.all([adoptionOf(organisationId, scenario), publishedSeries(scenario)])
  return {
    adopted: Object.fromEntries([...adoption.series].map(([component, row]) => [component, row.seriesId])) as Record<
      string,
      string
    >,
    published,
  }
})

/**
 * The first-outlook default: adopts the first published series of every component and the first
 * published correlation sets, when the organisation has adopted nothing for the scenario and every
 * component has a published series. Two requests at once adopt the same (the keys are unique).
 */
export async function ensureAdoption(organisationId: string, scenario: string) {
  const db = await useDb()
  const [existing] = await db.select({ component: seriesAdoptions.component }).from(seriesAdoptions)
    .where(and(eq(seriesAdoptions.organisationId, organisationId), eq(seriesAdoptions.scenario, scenario))).limit(1)
  if (existing) return
  const first = new Map<string, PublishedSeries>()
  for (const row of await publishedSeries(scenario)) if (!first.has(row.component)) first.set(row.component, row)
  if (COMPONENTS.some(component => !first.has(component))) return
  const [set] = await publishedCorrelationSets(scenario)
  await db.transaction(async (tx) => {
    const adopted = await tx
      .insert(seriesAdoptions)
      .values(
        [...first.values()].map(row => ({
          organisationId,
          scenario,
          component: row.component,
          seriesId: row.seriesId,
        })),
      )
      .onConflictDoNothing()
      .returning({ component: seriesAdoptions.component })
    await tx
      .insert(correlationAdoptions)
      .values({ organisationId, scenario, sourceOrganisationId: set?.organisationId ?? null })
      .onConflictDoNothing()
    if (adopted.length) {
      await writeAudit(
        tx,
        null,
        'science.adopted',
        { type: 'organisation', id: organisationId },
        {
          scenario,
          automatic: true,
          series: Object.fromEntries([...first].map(([component, row]) => [component, row.seriesId])),
          correlation: set?.organisationId ?? null,
        },
        organisationId,
      )
    }
  })
  // Also runs in background recomputations, where no finished request drops what status reads keep.
  forgetRecentReads()
}

const describeSeries = (row: Pick<PublishedSeries, 'title' | 'organisationName'>) =>
  `"${row.title}" (${row.organisationName})`

/**
 * The published release of every component in the series the organisation adopted for a scenario.
 * A component with no adopted series, or whose adopted series has no published version now, is
 * refused with a message saying what to adopt.
 */
export async function adoptedReleases(organisationId: string, scenario: string) {
  await ensureAdoption(organisationId, scenario)
  const [{ series: adopted }, published] = await Promise.all([
    adoptionOf(organisationId, scenario),
    publishedSeries(scenario),
  ])
  if (!adopted.size) {
    const missing = COMPONENTS.filter(component => !published.some(row => row.component === component))
    throw createError({
      statusCode: 400,
      message: `scenario: No published release for ${missing.join(', ')} under ${scenario}. Choose another scenario, or ask an analyst to publish ${missing.length > 1 ? 'them' : 'it'}.`,
    })
  }
  const problems: string[] = []
  const chosen = new Map<string, PublishedSeries>()
  for (const component of COMPONENTS) {
    const offers = published.filter(row => row.component === component)
    const available = offers.length
      ? ` Published series to choose from: ${offers.map(describeSeries).join(', ')}.`
      : ` No series of ${component} is published under ${scenario} yet; ask an analyst to publish one.`
    const choice = adopted.get(component)
    if (!choice) {
      problems.push(
        `Your organisation has adopted no series of ${component} for ${scenario}: adopt one on the science adoption page (Science adopted, /adoption).${available}`,
      )
      continue
    }
    const current = offers.find(row => row.seriesId === choice.seriesId)
    if (!current) {
      problems.push(
        `The series your organisation adopted for ${component} under ${scenario} has no published version now (withdrawn): adopt another on the science adoption page (/adoption), or ask its analysts to publish a new version.${available}`,
      )
      continue
    }
    chosen.set(component, current)
  }
  if (problems.length) throw createError({ statusCode: 400, message: `scenario: ${problems.join(' ')}` })
  return chosen
}

/** The organisation's adoption for every scenario with published science: adopted, and what else is offered. */
export async function adoptionView(viewer: CurrentUser, organisationId: string) {
  assertSameOrganisation(viewer, organisationId, 'organisation')
  const db = await useDb()
  const scenarios = new Set(
    (
      await db
        .selectDistinct({ scenario: series.scenario })
        .from(series)
        .innerJoin(releases, eq(releases.seriesId, series.id))
        .where(eq(releases.state, 'published'))
    ).map(row => row.scenario),
  )
  for (const row of await db
    .selectDistinct({ scenario: seriesAdoptions.scenario })
    .from(seriesAdoptions)
    .where(eq(seriesAdoptions.organisationId, organisationId)))
    scenarios.add(row.scenario)
  return {
    organisationId,
    scenarios: await Promise.all([...scenarios].sort().map(scenario => scenarioView(organisationId, scenario))),
  }
}

async function namesOf(ids: string[]) {
  if (!ids.length) return new Map<string, string>()
  const db = await useDb()
  return new Map(
    (await db.select({ id: users.id, name: users.name }).from(users).where(inArray(users.id, ids))).map(row => [
      row.id,
      row.name,
    ]),
  )
}

/** One scenario's adoption: per component the adopted series and those offered; the correlation choice; warnings. */
export async function scenarioView(organisationId: string, scenario: string) {
  const db = await useDb()
  const [adoption, published, sets] = await Promise.all([
    adoptionOf(organisationId, scenario),
    publishedSeries(scenario),
    publishedCorrelationSets(scenario),
  ])
  const people = await namesOf(
    [...adoption.series.values(), adoption.correlation].flatMap(row => (row?.adoptedBy ? [row.adoptedBy] : [])),
  )
  const adoptedSeriesIds = [...adoption.series.values()].map(row => row.seriesId)
  // An adopted series without a published version still has a title to show.
  const titles = new Map(
    adoptedSeriesIds.length
      ? (
          await db
            .select({ id: series.id, title: series.title, organisationName: organisations.name })
            .from(series)
            .innerJoin(organisations, eq(organisations.id, series.organisationId))
            .where(inArray(series.id, adoptedSeriesIds))
        ).map(row => [row.id, row])
      : [],
  )
  const offer = (row: PublishedSeries) => ({
    seriesId: row.seriesId,
    title: row.title,
    organisationName: row.organisationName,
    version: row.version,
    releaseId: row.releaseId,
    anchorYears: row.anchorYears,
  })
  const components = COMPONENTS.map((component) => {
    const choice = adoption.series.get(component)
    const current = choice && published.find(row => row.seriesId === choice.seriesId)
    const named = choice && titles.get(choice.seriesId)
    return {
      component,
      adopted: choice
        ? {
            seriesId: choice.seriesId,
            title: named?.title ?? '',
            organisationName: named?.organisationName ?? '',
            version: current?.version ?? null,
            releaseId: current?.releaseId ?? null,
            anchorYears: current?.anchorYears ?? null,
            adoptedAt: choice.adoptedAt,
            adoptedBy: choice.adoptedBy ? (people.get(choice.adoptedBy) ?? null) : null,
            automatic: !choice.adoptedBy,
          }
        : null,
      available: published.filter(row => row.component === component && row.seriesId !== choice?.seriesId).map(offer),
    }
  })
  const source = adoption.correlation?.source ?? null
  const adoptedSet = source ? sets.find(set => set.organisationId === source) : undefined
  const setView = (set: (typeof sets)[number]) => ({
    organisationId: set.organisationId,
    organisationName: set.organisationName,
    id: set.id,
    title: set.title,
    version: set.version,
    components: set.components,
    madeForSeries: set.madeForSeries,
  })
  const adoptedIds = Object.fromEntries([...adoption.series].map(([component, row]) => [component, row.seriesId]))
  return {
    scenario,
    decided: adoption.series.size > 0,
    components,
    correlation: {
      decided: adoption.correlation !== undefined,
      adopted: adoptedSet ? setView(adoptedSet) : null,
      /** The adopted organisation's sets, none published now (withdrawn). */
      adoptedUnpublished: Boolean(source && !adoptedSet),
      available: sets
        .filter(set => set.organisationId !== source)
        .map(set => ({ ...setView(set), otherSeries: otherSeries(set.madeForSeries, adoptedIds) })),
      otherSeries: adoptedSet ? otherSeries(adoptedSet.madeForSeries, adoptedIds) : [],
      adoptedAt: adoption.correlation?.adoptedAt ?? null,
      adoptedBy: adoption.correlation?.adoptedBy ? (people.get(adoption.correlation.adoptedBy) ?? null) : null,
    },
  }
}

/** Components a correlation set was made for another series of than the one adopted (a warning, not a refusal). */
export function otherSeries(madeFor: Record<string, string>, adopted: Record<string, string>) {
  return Object.entries(madeFor)
    .filter(([component, id]) => adopted[component] && adopted[component] !== id)
    .map(([component]) => component)
    .sort()
}

/**
 * Adopts series and correlation sets for one scenario. Every id must name something published for
 * that scenario and component; anything else is a 400 naming the field. Outlooks already computed
 * stay as they are: their pages offer to compute them again on the adopted science.
 */
export async function adopt(actor: CurrentUser, organisationId: string, input: AdoptionInput) {
  assertSameOrganisation(actor, organisationId, 'organisation')
  const published = await publishedSeries(input.scenario)
  const sets = await publishedCorrelationSets(input.scenario)
  if (!published.length) {
    throw createError({
      statusCode: 400,
      message: `scenario: Nothing is published under ${input.scenario}; choose a scenario from the list.`,
      data: { issues: [{ field: 'scenario', message: 'Choose a scenario from the list.' }] },
    })
  }
  const issues: Array<{ field: string, message: string }> = []
  for (const [component, id] of Object.entries(input.series ?? {})) {
    const row = published.find(p => p.seriesId === id)
    if (!row)
      issues.push({
        field: `series.${component}`,
        message: `No published series with this id under ${input.scenario}; choose one from the list.`,
      })
    else if (row.component !== component)
      issues.push({
        field: `series.${component}`,
        message: `This series is of ${row.component}, not ${component}; choose a series of ${component}.`,
      })
  }
  if (input.correlation && !sets.some(set => set.organisationId === input.correlation)) {
    issues.push({
      field: 'correlation',
      message: `That organisation has no published correlation set under ${input.scenario}; choose one from the list, or none.`,
    })
  }
  if (issues.length)
    throw createError({
      statusCode: 400,
      message: issues.map(i => `${i.field}: ${i.message}`).join(' '),
      data: { issues },
    })

  await ensureAdoption(organisationId, input.scenario)
  const before = await adoptionOf(organisationId, input.scenario)
  const db = await useDb()
  const now = new Date()
  await db.transaction(async (tx) => {
    const changes: Record<string, { from: string | null, to: string }> = {}
    for (const [component, seriesId] of Object.entries(input.series ?? {}) as Array<[string, string]>) {
      const was = before.series.get(component)?.seriesId ?? null
      if (was === seriesId) continue
      changes[component] = { from: was, to: seriesId }
      await tx
        .insert(seriesAdoptions)
        .values({ organisationId, scenario: input.scenario, component, seriesId, adoptedBy: actor.id, adoptedAt: now })
        .onConflictDoUpdate({
          target: [seriesAdoptions.organisationId, seriesAdoptions.scenario, seriesAdoptions.component],
          set: { seriesId, adoptedBy: actor.id, adoptedAt: now },
        })
    }
    let correlation: { from: string | null, to: string | null } | undefined
    const was = before.correlation === undefined ? undefined : before.correlation.source
    if (input.correlation !== undefined && (was === undefined || was !== input.correlation)) {
      correlation = { from: was ?? null, to: input.correlation }
      await tx
        .insert(correlationAdoptions)
        .values({
          organisationId,
          scenario: input.scenario,
          sourceOrganisationId: input.correlation,
          adoptedBy: actor.id,
          adoptedAt: now,
        })
        .onConflictDoUpdate({
          target: [correlationAdoptions.organisationId, correlationAdoptions.scenario],
          set: { sourceOrganisationId: input.correlation, adoptedBy: actor.id, adoptedAt: now },
        })
    }
    if (Object.keys(changes).length || correlation) {
      await writeAudit(
        tx,
        actor,
        'science.adopted',
        { type: 'organisation', id: organisationId },
        { scenario: input.scenario, series: changes, ...(correlation ? { correlation } : {}) },
      )
    }
  })
  return scenarioView(organisationId, input.scenario)
}
