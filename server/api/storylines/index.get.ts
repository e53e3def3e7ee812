import { listStorylines } from '~~/server/services/science-records'

// Public: published versions for anyone; signed-in people also see their organisation's drafts.
export default defineEventHandler(async (event) => {
  const viewer = await optionalUser(event)
  return listStorylines(viewer)
})
