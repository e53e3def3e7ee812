import { listSites } from '~~/server/services/site-list'

// The organisation's sites with each one's headline number (any signed-in member may read them).
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  return listSites(user)
})
