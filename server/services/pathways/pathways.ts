import { adaptationPathways } from '~~/server/db/schema'
import type { PathwayInput } from '#shared/pathways/schemas'
import type { CurrentUser } from '../../utils/auth'
import { loadSite } from '../sites'
import { refuse } from './refuse'
import { siteMeasures } from './store'

export async function createPathway(planner: CurrentUser, siteId: string, input: PathwayInput) {
  await loadSite(planner, siteId)
  const known = new Set((await siteMeasures(siteId)).map(m => m.id))
  input.measureIds.forEach((id, i) => {
    if (!known.has(id))
      refuse(`measureIds.${i}`, 'This is not a measure of this site; add it to the site\'s measures first.')
  })
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [row] = await tx
      .insert(adaptationPathways)
      .values({
        siteId,
        name: input.name,
        measureIds: input.measureIds,
        tolerances: input.tolerances,
        createdBy: planner.id,
      })
      .returning()
    await writeAudit(
      tx,
      planner,
      'pathway.created',
      { type: 'site', id: siteId },
      { pathway: row!.id, name: input.name, measureIds: input.measureIds },
    )
    return row!
  })
}
