import { TokenSchema } from '#shared/schemas/watches'
import { describeConfirmLink } from '~~/server/services/watches'

// What a confirmation link would start (site and address), without starting it: the page names the
// site before the reader presses, and says at once when the link is used up or expired.
export default defineEventHandler(async (event) => {
  await rateLimit(`watch-link:${clientKey(event)}`, 120, 3_600_000, 'link look-ups from this connection', event)
  const { token } = readValidQuery(event, TokenSchema)
  return describeConfirmLink(token)
})
