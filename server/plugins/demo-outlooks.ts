import { and, eq, notExists } from 'drizzle-orm'
import { organisations, outlooks, sites, users } from '~~/server/db/schema'
import { createBriefing, issueBriefing, setSharing } from '~~/server/services/briefings'
import { requestOutlook } from '~~/server/outlooks/queue'
import { loadSite } from '~~/server/services/sites'

// The demo opens with outlooks already computed for its towns, and a briefing issued for each, so
// a planner sees charts and a councillor a document at once.
// Runs in the background after start; PRECOMPUTE_DEMO_OUTLOOKS=false skips it (tests do).
const DEMO_SCENARIOS = ['SSP2-4.5', 'SSP5-8.5']

export default defineNitroPlugin(() => {
  if (!serverConfig().SEED_DEMO || !serverConfig().PRECOMPUTE_DEMO_OUTLOOKS) return
  precompute().catch(error =>
    console.error('[brinkwater] Demo outlooks were not precomputed:', error instanceof Error ? error.message : error),
  )
})

async function precompute() {
  const db = await useDb()
  const pending = await db
    .select({ id: sites.id, organisationId: sites.organisationId })
    .from(sites)
    .innerJoin(organisations, eq(organisations.id, sites.organisationId))
    .where(
      and(
        eq(organisations.illustrative, true),
        notExists(db.select({ id: outlooks.id }).from(outlooks).where(eq(outlooks.siteId, sites.id))),
      ),
    )
  for (const site of pending) {
    const [planner] = await db
      .select({ id: users.id })
      .from(users)
      .where(and(eq(users.organisationId, site.organisationId), eq(users.role, 'planner'), eq(users.disabled, false)))
      .limit(1)
    const user = planner && await loadSessionUser(planner.id)
    if (!user) continue
    const outlookIds: string[] = []
    for (const scenario of DEMO_SCENARIOS) {
      const { id, run } = await requestOutlook(user, site.id, { scenario, samples: 100_000, seed: 1, wait: true })
      await run
      outlookIds.push(id)
    }
    await issueDemoBriefing(user, site.id, outlookIds)
  }
  if (pending.length) console.info(`[brinkwater] Precomputed demo outlooks for ${pending.length} sites.`)
}

async function issueDemoBriefing(
  user: NonNullable<Awaited<ReturnType<typeof loadSessionUser>>>,
  siteId: string,
  [outlookId, ...comparisonOutlookIds]: string[],
) {
  const site = await loadSite(user, siteId)
  const draft = await createBriefing(user, {
    outlookId: outlookId!,
    comparisonOutlookIds,
    title: `${site.name}: sea level to 2100 (illustrative)`,
    audience: 'Councillors and the public (demo)',
    localContext: `An illustrative briefing for the invented town of ${site.name}.`,
    language: user.locale,
    units: 'm',
    thresholdIds: site.thresholds.map(t => t.id),
    years: [2050, 2100],
    includePathways: false,
  })
  await issueBriefing(user, draft.id)
  // One demo briefing is shared, so the public link can be tried without signing in.
  if (site.name === 'Kelwick') await setSharing(user, draft.id, true)
}
