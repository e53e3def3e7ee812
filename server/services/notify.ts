import { and, desc, eq } from 'drizzle-orm'
import { briefings, outlooks, sites, thresholds, users, watches, type OutlookReleaseRef } from '~~/server/db/schema'
import type { OutlookResult } from '#shared/engine'
import { formatHeight } from '#shared/units'
import { formatChance, type Language } from '#shared/wording/chance'
import { BRIEFING_TEXT } from '#shared/briefing/text'
import { briefingIssuedMail, whatChangedMail, type ChangeRow, type RangeRow, type ReleaseChange } from '../mail/templates'
import { requestOutlook } from './outlooks'
import { unsubscribeHeaders, unsubscribeUrl } from './watches'

// When the science or a site changes, the people watching the site hear about it: the affected
// outlooks are recomputed in the background with the same seed and samples, and each watcher gets
// one e-mail per event, in their language, with the numbers before and after.

const KEY_YEARS = [2050, 2100]
export type Cause = Record<Language, string>

/** Runs a notification in the background; a failure is logged, never thrown at the request. */
function inBackground(what: string, work: () => Promise<void>) {
  work().catch(error => console.error(`[brinkwater] ${what} failed:`, error))
}

async function activeWatches(siteId: string) {
  const db = await useDb()
  return db.select().from(watches).where(and(eq(watches.siteId, siteId), eq(watches.state, 'active')))
}

/** A planner of the site's organisation to run the recompute as (any active one). */
async function actingPlanner(organisationId: string) {
  const db = await useDb()
  const [row] = await db.select({ id: users.id }).from(users).where(and(eq(users.organisationId, organisationId), eq(users.role, 'planner'), eq(users.disabled, false))).limit(1)
  return row ? loadSessionUser(row.id) : undefined
}

/** The latest finished outlook of each scenario computed for a site. */
async function latestOutlooks(siteId: string) {
  const db = await useDb()
  const rows = await db.select().from(outlooks).where(and(eq(outlooks.siteId, siteId), eq(outlooks.state, 'done'))).orderBy(desc(outlooks.finishedAt))
  const latest = new Map<string, typeof rows[number]>()
  for (const row of rows) if (!latest.has(row.scenario)) latest.set(row.scenario, row)
  return [...latest.values()]
}

interface Comparison { scenario: string, before: typeof outlooks.$inferSelect, after: typeof outlooks.$inferSelect }

function median(result: OutlookResult, t: number, level: number) {
  return result.byYear[t]!.percentiles.find(p => Math.abs(p.level - level) < 1e-9)!.value
}

function describe(comparisons: Comparison[], labels: Map<string, string>, language: Language) {
  const height = (m: number) => formatHeight(m, 'm', language)
  const chances: ChangeRow[] = []
  const ranges: RangeRow[] = []
  const releases: ReleaseChange[] = []
  for (const { scenario, before, after } of comparisons) {
    const b = before.result as unknown as OutlookResult
    const a = after.result as unknown as OutlookResult
    for (const threshold of a.thresholds) {
      const old = b.thresholds.find(t => t.key === threshold.key)
      for (const year of KEY_YEARS) {
        const ta = a.years.indexOf(year)
        const tb = b.years.indexOf(year)
        if (ta < 0) continue
        chances.push({
          threshold: `${labels.get(threshold.key) ?? threshold.key} (${height(threshold.height)}, ${scenario})`, year,
          before: old && tb >= 0 ? formatChance(old.byYear[tb]!.value, language) : '—',
          after: formatChance(threshold.byYear[ta]!.value, language),
        })
      }
    }
    const year = a.years.includes(2100) ? 2100 : a.years.at(-1)!
    const range = (r: OutlookResult) => {
      const t = r.years.indexOf(year)
      return t < 0 ? '—' : `${height(median(r, t, 0.5))} (${height(median(r, t, 0.17))}–${height(median(r, t, 0.83))})`
    }
    ranges.push({ scenario, year, before: range(b), after: range(a) })
    const names = BRIEFING_TEXT[language].components
    for (const ref of after.releaseRefs as OutlookReleaseRef[]) {
      const was = (before.releaseRefs as OutlookReleaseRef[]).find(r => r.component === ref.component)
      if (was?.releaseId !== ref.releaseId) releases.push({ component: `${names[ref.component] ?? ref.component} (${scenario})`, from: was ? `v${was.version}` : '—', to: `v${ref.version}`, citation: ref.citation })
    }
  }
  return { chances, ranges, releases }
}

async function latestBriefingUrl(siteId: string) {
  const db = await useDb()
  const [shared] = await db.select({ token: briefings.shareToken }).from(briefings)
    .where(and(eq(briefings.siteId, siteId), eq(briefings.state, 'issued'))).orderBy(desc(briefings.issuedAt)).limit(1)
  return shared?.token ? `${appUrl()}/shared/${shared.token}` : null
}

/** Recomputes a site's latest outlooks and mails each watcher what changed (nothing if nothing did). */
export async function recomputeAndNotify(siteId: string, cause: Cause, scenarios?: string[]) {
  const watchers = await activeWatches(siteId)
  if (!watchers.length) return
  const db = await useDb()
  const [site] = await db.select().from(sites).where(eq(sites.id, siteId))
  const actor = site && await actingPlanner(site.organisationId)
  if (!site || !actor) return
  const comparisons: Comparison[] = []
  for (const before of await latestOutlooks(siteId)) {
    if (scenarios && !scenarios.includes(before.scenario)) continue
    const outcome = await requestOutlook(actor, siteId, { scenario: before.scenario, samples: before.samples, seed: before.seed, wait: true }).catch(() => null)
    if (!outcome || outcome.id === before.id) continue
    await outcome.run
    const [after] = await db.select().from(outlooks).where(eq(outlooks.id, outcome.id))
    if (after?.state === 'done') comparisons.push({ scenario: before.scenario, before, after })
  }
  if (!comparisons.length) return
  const labels = new Map((await loadSiteThresholds(siteId)).map(t => [t.id, t.label]))
  const briefingUrl = await latestBriefingUrl(siteId)
  const event = comparisons.map(c => c.after.id).sort().join(',')
  await db.transaction(async (tx) => {
    for (const watch of watchers) {
      const language: Language = watch.language === 'es' ? 'es' : 'en'
      const mail = whatChangedMail({ language, site: site.name, cause: cause[language], ...describe(comparisons, labels, language), briefingUrl, unsubscribeUrl: unsubscribeUrl(watch.unsubscribeToken) })
      await queueMail(tx, { to: watch.email, ...mail, headers: unsubscribeHeaders(watch.unsubscribeToken), dedupeKey: `change:${event}:${watch.id}` })
    }
  })
}

async function loadSiteThresholds(siteId: string) {
  const db = await useDb()
  return db.select({ id: thresholds.id, label: thresholds.label }).from(thresholds).where(eq(thresholds.siteId, siteId))
}

/** A release was published or withdrawn: every watched site with an outlook of that scenario. */
export function notifyScienceChange(scenario: string, cause: Cause) {
  inBackground('science-change notification', async () => {
    const db = await useDb()
    const watched = await db.selectDistinct({ siteId: watches.siteId }).from(watches)
      .innerJoin(outlooks, eq(outlooks.siteId, watches.siteId))
      .where(and(eq(watches.state, 'active'), eq(outlooks.scenario, scenario)))
    for (const { siteId } of watched) await recomputeAndNotify(siteId, cause, [scenario])
  })
}

export function notifySiteChange(siteId: string, cause: Cause) {
  inBackground('site-change notification', () => recomputeAndNotify(siteId, cause))
}

export function notifyBriefingIssued(briefingId: string) {
  inBackground('briefing notification', async () => {
    const db = await useDb()
    const [row] = await db.select({ siteId: briefings.siteId, title: briefings.title, token: briefings.shareToken, site: sites.name })
      .from(briefings).innerJoin(sites, eq(sites.id, briefings.siteId)).where(eq(briefings.id, briefingId))
    if (!row) return
    const watchers = await activeWatches(row.siteId)
    const url = row.token ? `${appUrl()}/shared/${row.token}` : await latestBriefingUrl(row.siteId)
    await db.transaction(async (tx) => {
      for (const watch of watchers) {
        const language: Language = watch.language === 'es' ? 'es' : 'en'
        const mail = briefingIssuedMail(language, row.site, row.title, url, unsubscribeUrl(watch.unsubscribeToken))
        await queueMail(tx, { to: watch.email, ...mail, headers: unsubscribeHeaders(watch.unsubscribeToken), dedupeKey: `briefing:${briefingId}:${watch.id}` })
      }
    })
  })
}
