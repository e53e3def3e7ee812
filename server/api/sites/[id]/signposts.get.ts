import { IdParams, SignpostsQuery } from '#shared/schemas/params'
import { siteSignposts } from '~~/server/services/pathways/signposts'

// Signposts for the decision after a measure of a pathway: how often a gauge-rate signal would fire too
// late, miss or fire needlessly across the scenario's outlook. Anyone in the site's organisation may read them.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const query = readValidQuery(event, SignpostsQuery)
  return siteSignposts(user, id, query)
})
