import { listOwnWatches } from '~~/server/services/watches'

// The signed-in user's own watches (by their e-mail address).
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  return listOwnWatches(user)
})
