import { and, desc, eq, inArray, isNull } from 'drizzle-orm'
import { briefings, outlooks, sites, thresholds, users } from '~~/server/db/schema'
import type { OutlookResult } from '#shared/engine'
import { formatChance } from '#shared/wording/chance'
import { languageOf } from '#shared/wording/translate'
import type { StaleFigure, Staleness } from '#shared/types/staleness'
import { gaugeUpdateChanges } from '#shared/briefing/gauge-staleness'
import { staleLine } from '#shared/briefing/stale-line'
import { briefingStaleMail } from '../mail/templates'

// An issued briefing never changes. When a newer outlook of its site and scenario gives different
// numbers for the thresholds and years it states, the briefing is out of date: its pages say what
// changed ("19 % now, 4 % in this briefing"), its planners get one e-mail, and a planner can start a
// new version from the latest outlooks. A figure counts as changed when it reads differently in the
// briefing's language (a Monte Carlo wobble below a rounded percent is not news). It is worked out
// when an outlook of the site finishes, when the briefing is issued and after a recomputation, and
// stored on the briefing (`briefings.staleness`): its pages only read it.

type Briefing = typeof briefings.$inferSelect

export type { StaleFigure, Staleness }

/** The chance a briefing states for a threshold in a year: above the mean sea, or the flood level's that year. */
function chanceIn(result: OutlookResult, thresholdId: string, year: number) {
  const threshold = result.thresholds.find(t => t.key === thresholdId)
  const index = result.years.indexOf(year)
  if (!threshold || index < 0) return null
  if (threshold.kind === 'flood-level')
    return { kind: 'flood-level' as const, value: threshold.flood?.annualChance[index]?.value ?? null }
  return { kind: 'mean-sea-level' as const, value: threshold.byYear[index]?.value ?? null }
}

/** The latest finished outlook of each scenario at a site (id and when it finished). */
async function latestBySiteScenario(siteId: string, scenarios: string[]) {
  const db = await useDb()
  const rows = await db
    .selectDistinctOn([outlooks.scenario], {
      id: outlooks.id,
      scenario: outlooks.scenario,
      finishedAt: outlooks.finishedAt,
    })
    .from(outlooks)
    .where(and(eq(outlooks.siteId, siteId), eq(outlooks.state, 'done'), inArray(outlooks.scenario, scenarios)))
    .orderBy(outlooks.scenario, desc(outlooks.finishedAt))
  return new Map(rows.map(row => [row.scenario, row]))
}

/** What newer outlooks change in an issued briefing; null for a draft or one that is still current. */
async function briefingStaleness(row: Briefing): Promise<Staleness | null> {
  if (row.state !== 'issued' || !row.outlookIds.length) return null
  const db = await useDb()
  const used = await db
    .select({ id: outlooks.id, scenario: outlooks.scenario, finishedAt: outlooks.finishedAt })
    .from(outlooks)
    .where(inArray(outlooks.id, row.outlookIds))
  const latest = await latestBySiteScenario(row.siteId, [...new Set(used.map(o => o.scenario))])
  const replaced = used.filter((o) => {
    const now = latest.get(o.scenario)
    return now && now.id !== o.id && (now.finishedAt?.getTime() ?? 0) > (o.finishedAt?.getTime() ?? 0)
  })
  if (!replaced.length) return null
  const ids = [...replaced.map(o => o.id), ...replaced.map(o => latest.get(o.scenario)!.id)]
  const results = new Map(
    (await db.select({ id: outlooks.id, result: outlooks.result }).from(outlooks).where(inArray(outlooks.id, ids)))
      // Both sides are latest finished outlooks or ones a briefing was made of: finished, with results.
      .map(o => [o.id, o.result!]),
  )
  const labels = new Map(
    (
      await db
        .select({ id: thresholds.id, label: thresholds.label })
        .from(thresholds)
        .where(inArray(thresholds.id, row.thresholdIds))
    ).map(t => [t.id, t.label]),
  )
  const language = languageOf(row.language)
  const changes: StaleFigure[] = []
  // In the briefing's order: its own scenario first, then those compared with it.
  for (const id of row.outlookIds) {
    const before = replaced.find(o => o.id === id)
    if (!before) continue
    const was = results.get(id)
    const now = results.get(latest.get(before.scenario)!.id)
    if (!was || !now) continue
    for (const thresholdId of row.thresholdIds) {
      for (const year of row.years) {
        const a = chanceIn(was, thresholdId, year)
        const b = chanceIn(now, thresholdId, year)
        if (a?.value == null || b?.value == null || a.kind !== b.kind) continue
        if (formatChance(a.value, language) === formatChance(b.value, language)) continue
        changes.push({
          scenario: before.scenario,
          thresholdId,
          threshold: labels.get(thresholdId) ?? thresholdId,
          kind: b.kind,
          year,
          was: a.value,
          now: b.value,
        })
      }
    }
  }
  const own = replaced.find(o => o.id === row.outlookIds[0])
  const ownWas = own && results.get(own.id)
  const ownNow = own && results.get(latest.get(own.scenario)!.id)
  if (own && ownWas && ownNow) {
    for (const change of gaugeUpdateChanges(ownWas, ownNow, language)) {
      const threshold = labels.get(change.thresholdId) ?? change.thresholdId
      changes.push({ ...change, scenario: own.scenario, threshold })
    }
  }
  if (!changes.length) return null
  return {
    latestOutlookIds: row.outlookIds.map(id => latest.get(used.find(o => o.id === id)?.scenario ?? '')?.id ?? id),
    changes,
  }
}

/** Works out and stores the staleness of one briefing (an issued one; a draft is never stale). */
async function storeStaleness(row: Briefing): Promise<Briefing> {
  const staleness = await briefingStaleness(row)
  const db = await useDb()
  const stalenessCheckedAt = new Date()
  await db.update(briefings).set({ staleness, stalenessCheckedAt }).where(eq(briefings.id, row.id))
  return { ...row, staleness, stalenessCheckedAt }
}

/** After a briefing is issued: whether a newer outlook already changes what it says. */
export async function refreshStaleness(briefingId: string) {
  const db = await useDb()
  const [row] = await db.select().from(briefings).where(and(eq(briefings.id, briefingId), eq(briefings.state, 'issued')))
  if (row) await storeStaleness(row)
}

/**
 * Issued briefings whose staleness was never worked out (issued before it was stored): worked out
 * once at start, so an overtaken briefing is not shown as current until its site's next outlook.
 */
export async function backfillStaleness() {
  const db = await useDb()
  const unchecked = await db
    .select()
    .from(briefings)
    .where(and(eq(briefings.state, 'issued'), isNull(briefings.stalenessCheckedAt)))
  for (const row of unchecked) await storeStaleness(row)
  return unchecked.length
}

/** After an outlook of the site finished: every issued briefing of it, its staleness stored again. */
export async function refreshSiteStaleness(siteId: string) {
  const db = await useDb()
  const issued = await db
    .select()
    .from(briefings)
    .where(and(eq(briefings.siteId, siteId), eq(briefings.state, 'issued')))
  const refreshed: Briefing[] = []
  for (const row of issued) refreshed.push(await storeStaleness(row))
  return refreshed
}

/**
 * After a recomputation of a site: stores every issued briefing's staleness, then each one that has
 * no issued newer version and whose numbers changed mails its planners (author and issuer, if still
 * active planners) once. The key names the outlooks that made it stale, so a later change mails again
 * and this one never twice.
 */
export async function mailStaleBriefings(siteId: string) {
  const db = await useDb()
  const issued = await refreshSiteStaleness(siteId)
  const superseded = new Set(issued.map(b => b.previousId).filter(Boolean))
  const [site] = await db.select({ name: sites.name }).from(sites).where(eq(sites.id, siteId))
  if (!site) return
  for (const row of issued) {
    const staleness = row.staleness
    if (superseded.has(row.id) || !staleness) continue
    const planners = await db
      .select({ id: users.id, email: users.email, locale: users.locale })
      .from(users)
      .where(
        and(
          inArray(users.id, [...new Set([row.createdBy, row.issuedBy].filter((id): id is string => id !== null))]),
          eq(users.role, 'planner'),
          eq(users.disabled, false),
        ),
      )
    const event = staleness.latestOutlookIds.join(',')
    await db.transaction(async (tx) => {
      for (const planner of planners) {
        const language = languageOf(planner.locale)
        const mail = briefingStaleMail({
          language, site: site.name, title: row.title, version: row.version,
          changes: staleness.changes.map(change => staleLine(change, language)), url: `${appUrl()}/briefings/${row.id}`,
        })
        await queueMail(tx, {
          to: planner.email,
          ...mail,
          dedupeKey: `briefing-stale:${row.id}:${event}:${planner.id}`,
        })
      }
    })
  }
}
