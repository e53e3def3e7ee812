import { attentionFor } from '~~/server/services/attention'

// What is waiting for the signed-in person in their own organisation (the overview's first section).
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  return attentionFor(user)
})
