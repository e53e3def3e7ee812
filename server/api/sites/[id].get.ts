import { IdParams } from '#shared/schemas/params'
import { listSiteOutlooks } from '~~/server/outlooks/list'
import { pathwayCounts } from '~~/server/services/pathways/briefing-section'
import { openAlertCount } from '~~/server/services/pathways/store'
import { loadSite } from '~~/server/services/sites'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const site = await loadSite(user, id)
  return {
    ...site,
    outlooks: await listSiteOutlooks(id),
    decisionAlerts: await openAlertCount(id),
    pathwayCounts: await pathwayCounts(id),
    canEdit: user.role === 'planner',
  }
})
