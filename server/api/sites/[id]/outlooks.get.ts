import { IdParams } from '#shared/schemas/params'
import { listSiteOutlooks } from '~~/server/outlooks/list'
import { loadSite } from '~~/server/services/sites'

export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  await loadSite(user, id)
  return listSiteOutlooks(id)
})
