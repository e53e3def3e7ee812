import { ReleaseListQuery } from '#shared/schemas/releases'
import { listReleases } from '~~/server/services/releases'

// Public: published releases for anyone; signed-in people also see their organisation's drafts.
export default defineEventHandler(async (event) => {
  const viewer = await optionalUser(event)
  const filter = readValidQuery(event, ReleaseListQuery)
  return listReleases(viewer, filter)
})
