import { eq, sql } from 'drizzle-orm'
import { outlooks } from '~~/server/db/schema'
import type { CurrentUser } from '../utils/auth'
import { preparedQuery } from '../utils/prepared-query'
import { newerScience } from './newer-science'
import { keptOutlook, loadOutlook, readableSite } from './read'
import { storylinesAt } from './storylines'

// What changes about an outlook while it is read, apart from the stored outlook itself: its progress
// while it runs, its site's name and datum name as they are now, newer and offered science, and the
// published storylines of its scenario. Read fresh on every request; the page polls it while running.

/** While running, only the small columns: the page asks for them twice a second. */
const progressQuery = preparedQuery(db =>
  db
    .select({
      id: outlooks.id,
      siteId: outlooks.siteId,
      scenario: outlooks.scenario,
      state: outlooks.state,
      progress: outlooks.progress,
      releaseRefs: outlooks.releaseRefs,
    })
    .from(outlooks)
    .where(eq(outlooks.id, sql.placeholder('id')))
    .prepare('outlook_progress'),
)

async function liveOutlook(id: string) {
  const kept = keptOutlook(id)
  if (kept) return { ...kept, progress: null }
  const [row] = await (await progressQuery()).execute({ id })
  if (!row) return undefined
  // A finished outlook is loaded (and kept) once for the storylines' basis, which its input gives.
  if (row.state === 'done') {
    const finished = await loadOutlook(id)
    return finished && { ...finished, progress: null }
  }
  return { ...row, progress: row.state === 'running' ? row.progress : null, storylineBasis: null }
}

export async function outlookStatus(user: CurrentUser, id: string) {
  const outlook = await liveOutlook(id)
  const site = await readableSite(user, outlook)
  const { scenario, state, progress, releaseRefs } = outlook!
  const science = await newerScience(site.organisationId, scenario, releaseRefs)
  return {
    state,
    /** Share of the samples drawn so far (0–1) while running, otherwise null. */
    progress,
    siteName: site.name,
    referenceLevel: site.referenceLevel,
    newerScience: science.newer,
    offeredScience: science.offered,
    /** Published high-end storylines of the scenario placed at the site (none until it is done). */
    storylines: await storylinesAt(outlook!),
  }
}
