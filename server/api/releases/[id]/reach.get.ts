import { IdParams } from '#shared/schemas/params'
import { releaseReach } from '~~/server/services/publication-reach'

// How many sites approving this release would compute again and how many watchers it may mail,
// for the confirmation the reviewer reads before approving. Analysts of the release's organisation only.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, 'analyst')
  const { id } = readValidParams(event, IdParams)
  return releaseReach(user, id)
})
