import { IdParams } from '#shared/schemas/params'
import { listSiteOutlooks } from '~~/server/outlooks/list'
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
    canEdit: user.role === 'planner',
  }
})
