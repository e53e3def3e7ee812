import { TokenSchema } from '#shared/schemas/watches'
import { confirmWatch } from '~~/server/services/watches'

// The link from the confirmation e-mail (double opt-in); it works once.
export default defineEventHandler(async (event) => {
  await rateLimit(`watch-confirm:${clientKey(event)}`, 60, 3_600_000, 'confirmation attempts', event)
  const { token } = await readValidBody(event, TokenSchema)
  return confirmWatch(token)
})
