import { and, desc, eq, inArray, isNull } from 'drizzle-orm'
import { briefings, outlooks, sites, thresholds, watches } from '~~/server/db/schema'
import type { OutlookResult } from '#shared/engine'
import { formatHeight } from '#shared/units'
import { chanceAfterDe, formatChance } from '#shared/wording/chance'
import { causeSentence } from '#shared/wording/causes'
import { languageOf, translator, type Language } from '#shared/wording/translate'
import type { StoredCause } from '#shared/types/causes'
import { updateSectionYear } from '#shared/observations/update-year'
import {
  briefingIssuedMail,
  whatChangedMail,
  type ChangeRow,
  type HorizonChange,
  type RangeRow,
  type ReleaseChange,
} from '../mail/templates'
import { headlineOf } from './site-list'
import { unsubscribeHeaders, unsubscribeUrl } from './watches'

// The e-mails watchers get: what changed at a site after a recomputation (see recompute.ts), with
// the numbers before and after, and that a new briefing was issued. One e-mail per event and
// watcher, in the watcher's language.

const KEY_YEARS = [2050, 2100]

async function activeWatches(siteId: string) {
  const db = await useDb()
  return db
    .select()
    .from(watches)
    .where(and(eq(watches.siteId, siteId), eq(watches.state, 'active'), isNull(watches.undeliverableAt)))
}

/** The latest finished outlook of each scenario computed for a site. */
export async function latestOutlooks(siteId: string) {
  const db = await useDb()
  // Ids first, so only one full result per scenario is read: a site recomputed for years keeps every
  // earlier outlook, each with a result of about 120 kB.
  const latest = await db.selectDistinctOn([outlooks.scenario], { id: outlooks.id }).from(outlooks)
    .where(and(eq(outlooks.siteId, siteId), eq(outlooks.state, 'done')))
    .orderBy(outlooks.scenario, desc(outlooks.finishedAt), desc(outlooks.id))
  if (!latest.length) return []
  return db
    .select()
    .from(outlooks)
    .where(
      inArray(
        outlooks.id,
        latest.map(row => row.id),
      ),
    )
    .orderBy(desc(outlooks.finishedAt))
}

export interface Comparison {
  scenario: string
  before: typeof outlooks.$inferSelect
  after: typeof outlooks.$inferSelect
}

function median(byYear: Pick<OutlookResult['byYear'][number], 'percentiles'>[], t: number, level: number) {
  return byYear[t]!.percentiles.find(p => Math.abs(p.level - level) < 1e-9)!.value
}

/**
 * What a watch may be told. One started from a shared briefing's link sees that briefing's
 * thresholds, scenarios and years, and links to it; null when that link no longer works.
 */
interface WatchScope { thresholdIds: Set<string>, scenarios: Set<string>, years: number[], url: string }

async function scopeOf(watch: typeof watches.$inferSelect): Promise<WatchScope | 'everything' | null> {
  if (!watch.briefingId) return 'everything'
  const db = await useDb()
  const [briefing] = await db.select().from(briefings).where(eq(briefings.id, watch.briefingId))
  if (!briefing?.shareToken || briefing.state !== 'issued') return null
  const shown = await db
    .select({ scenario: outlooks.scenario })
    .from(outlooks)
    .where(inArray(outlooks.id, briefing.outlookIds))
  return {
    thresholdIds: new Set(briefing.thresholdIds), scenarios: new Set(shown.map(row => row.scenario)),
    years: [...briefing.years].sort((a, b) => a - b), url: `${appUrl()}/shared/${briefing.shareToken}`,
  }
}

function describe(
  allComparisons: Comparison[],
  labels: Map<string, string>,
  language: Language,
  scope: WatchScope | 'everything',
) {
  const scoped = scope === 'everything' ? null : scope
  const comparisons = scoped ? allComparisons.filter(c => scoped.scenarios.has(c.scenario)) : allComparisons
  const keyYears = scoped?.years ?? KEY_YEARS
  const height = (m: number) => formatHeight(m, 'm', language)
  const t = translator(language)
  const chances: ChangeRow[] = []
  const ranges: RangeRow[] = []
  const updatedRanges: RangeRow[] = []
  const releases: ReleaseChange[] = []
  const horizons: HorizonChange[] = []
  for (const { scenario, before, after } of comparisons) {
    // A comparison is between finished outlooks, which have their results.
    const b = before.result!
    const a = after.result!
    const offset = (outlook: typeof before) => outlook.input.datum?.offset ?? 0
    for (const threshold of a.thresholds) {
      if (scoped && !scoped.thresholdIds.has(threshold.key)) continue
      const old = b.thresholds.find(t => t.key === threshold.key)
      // A flood level's number is the chance that the water reaches it in that year; a mean-sea-level
      // threshold's is the chance the mean sea is above it. The row says which.
      const chanceIn = (t: typeof threshold | undefined, index: number) => {
        if (!t || index < 0) return null
        if (t.kind === 'flood-level') return t.flood?.annualChance[index]?.value ?? null
        return t.byYear[index]?.value ?? null
      }
      const what = t(
        threshold.kind === 'flood-level'
          ? 'emails.whatChanged.measures.flood'
          : 'emails.whatChanged.measures.meanSeaLevel',
      )
      for (const year of keyYears) {
        const ta = a.years.indexOf(year)
        const tb = b.years.indexOf(year)
        const now = chanceIn(threshold, ta)
        if (now === null) continue
        const was = old?.kind === threshold.kind ? chanceIn(old, tb) : null
        chances.push({
          threshold: `${labels.get(threshold.key) ?? threshold.key} (${height(threshold.height + offset(after))}, ${what}, ${scenario})`,
          year,
          before: was === null ? '—' : formatChance(was, language),
          after: formatChance(now, language),
        })
      }
    }
    if (a.years.at(-1) !== b.years.at(-1)) horizons.push({ scenario, before: b.years.at(-1)!, after: a.years.at(-1)! })
    const year = scoped
      ? scoped.years.findLast(y => a.years.includes(y))
      : a.years.includes(2100)
        ? 2100
        : a.years.at(-1)!
    if (year === undefined) continue
    const range = (r: OutlookResult, byYear: Parameters<typeof median>[0] = r.byYear, at = year) => {
      const i = r.years.indexOf(at)
      return i < 0 ? '—' : `${height(median(byYear, i, 0.5))} (${height(median(byYear, i, 0.17))}–${height(median(byYear, i, 0.83))})`
    }
    ranges.push({ scenario, year, before: range(b), after: range(a) })
    // A new gauge record leaves the projections as they were; what moves is the range the record updates,
    // in the last year it reaches (past that the updated range is the outlook's own).
    if (b.observationUpdate || a.observationUpdate) {
      const reached = updateSectionYear(a.observationUpdate, a.baselineYear)
        ?? updateSectionYear(b.observationUpdate, b.baselineYear)
      const updated = (r: OutlookResult) => {
        const update = r.observationUpdate
        if (!update) return t('emails.whatChanged.updateNone')
        if (update.refused) return t('emails.whatChanged.updateRefused')
        const i = reached === null ? -1 : r.years.indexOf(reached)
        if (i < 0 || update.byYear[i]!.carried === 0) return t('emails.whatChanged.updateOutOfReach')
        return range(r, update.byYear, reached!)
      }
      updatedRanges.push({ scenario, year: reached ?? year, before: updated(b), after: updated(a) })
    }
    for (const ref of after.releaseRefs) {
      const was = before.releaseRefs.find(r => r.component === ref.component)
      if (was?.releaseId !== ref.releaseId)
        releases.push({
          component: `${t(`document.components.${ref.component}`)} (${scenario})`,
          from: was ? `v${was.version}` : '—',
          to: `v${ref.version}`,
          citation: ref.citation,
        })
    }
  }
  return { chances, ranges, updatedRanges, releases, horizons, shown: comparisons.length }
}

/**
 * The site's headline under its planning scenario, named, before and after: the number lists and
 * the map show, so a reader never mistakes another scenario's chance for it.
 */
function planningSentence(
  planningScenario: string,
  comparisons: Comparison[],
  labels: Map<string, string>,
  language: Language,
) {
  const t = translator(language)
  const named = t('emails.whatChanged.planningScenario', { scenario: planningScenario })
  const change = comparisons.find(c => c.scenario === planningScenario)
  if (!change) return t('emails.whatChanged.planningUntouched', { named })
  const offset = (outlook: Comparison['after']) => outlook.input.datum?.offset ?? 0
  const now = headlineOf(change.after.result!, labels, offset(change.after))
  const was = headlineOf(change.before.result!, labels, offset(change.before))
  if (!now) return t('emails.whatChanged.planningNoThreshold', { named })
  return t('emails.whatChanged.planningHeadline', {
    named,
    threshold: now.thresholdLabel,
    height: formatHeight(now.height, 'm', language),
    year: now.year,
    chance: formatChance(now.probability, language),
    chanceAfterDe: chanceAfterDe(now.probability),
    before: was ? formatChance(was.probability, language) : '—',
  })
}

async function latestBriefingUrl(siteId: string) {
  const db = await useDb()
  const [shared] = await db.select({ token: briefings.shareToken }).from(briefings)
    .where(and(eq(briefings.siteId, siteId), eq(briefings.state, 'issued'))).orderBy(desc(briefings.issuedAt)).limit(1)
  return shared?.token ? `${appUrl()}/shared/${shared.token}` : null
}

/** Mails each watcher of a site the numbers before and after a recomputation, in their language. */
export async function mailWhatChanged(siteId: string, cause: StoredCause, comparisons: Comparison[]) {
  const watchers = await activeWatches(siteId)
  if (!watchers.length || !comparisons.length) return
  const db = await useDb()
  const [site] = await db
    .select({ name: sites.name, planningScenario: sites.planningScenario })
    .from(sites)
    .where(eq(sites.id, siteId))
  if (!site) return
  // The planning scenario's rows come first in the tables, as its sentence does above them.
  const ordered = [...comparisons].sort(
    (a, b) => Number(b.scenario === site.planningScenario) - Number(a.scenario === site.planningScenario),
  )
  const labels = new Map((await loadSiteThresholds(siteId)).map(t => [t.id, t.label]))
  const briefingUrl = await latestBriefingUrl(siteId)
  // The same recomputation mails each watcher once, even when its job runs again after a crash.
  const event = comparisons.map(c => c.after.id).sort().join(',')
  const scopes = new Map(await Promise.all(watchers.map(async watch => [watch.id, await scopeOf(watch)] as const)))
  await db.transaction(async (tx) => {
    for (const watch of watchers) {
      const scope = scopes.get(watch.id)
      if (!scope) continue
      const language = languageOf(watch.language)
      const { shown, ...numbers } = describe(ordered, labels, language, scope)
      // Nothing the watcher's briefing showed has changed: nothing to tell them.
      if (!shown) continue
      // A watch from a shared briefing hears only what that briefing showed, so not the planning headline.
      const planning
        = scope === 'everything' ? planningSentence(site.planningScenario, ordered, labels, language) : undefined
      const mail = whatChangedMail({
        language,
        site: site.name,
        cause: causeSentence(cause, language),
        ...numbers,
        planning,
        briefingUrl: scope === 'everything' ? briefingUrl : scope.url,
        unsubscribeUrl: unsubscribeUrl(watch.unsubscribeToken),
      })
      await queueMail(tx, {
        to: watch.email,
        ...mail,
        headers: unsubscribeHeaders(watch.unsubscribeToken),
        dedupeKey: `change:${event}:${watch.id}`,
      })
    }
  })
}

async function loadSiteThresholds(siteId: string) {
  const db = await useDb()
  return db.select({ id: thresholds.id, label: thresholds.label }).from(thresholds).where(eq(thresholds.siteId, siteId))
}

/** Mails each watcher of the briefing's site that a new briefing was issued. */
export async function mailBriefingIssued(briefingId: string) {
  const db = await useDb()
  const [row] = await db
    .select({ siteId: briefings.siteId, title: briefings.title, token: briefings.shareToken, site: sites.name })
    .from(briefings)
    .innerJoin(sites, eq(sites.id, briefings.siteId))
    .where(eq(briefings.id, briefingId))
  if (!row) return
  const watchers = await activeWatches(row.siteId)
  const url = row.token ? `${appUrl()}/shared/${row.token}` : await latestBriefingUrl(row.siteId)
  await db.transaction(async (tx) => {
    // A watch from a shared link sees that briefing only, not what else the organisation issues.
    for (const watch of watchers.filter(w => !w.briefingId)) {
      const language = languageOf(watch.language)
      const mail = briefingIssuedMail(language, row.site, row.title, url, unsubscribeUrl(watch.unsubscribeToken))
      await queueMail(tx, {
        to: watch.email,
        ...mail,
        headers: unsubscribeHeaders(watch.unsubscribeToken),
        dedupeKey: `briefing:${briefingId}:${watch.id}`,
      })
    }
  })
}
