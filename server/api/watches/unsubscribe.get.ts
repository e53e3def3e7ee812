import { TokenSchema } from '#shared/schemas/watches'
import { describeUnsubscribeLink } from '~~/server/services/watches'

// What an unsubscribe link would stop, and whether it already is stopped, without stopping it. A GET
// never unsubscribes: mail scanners open links, and RFC 8058's one-click stop is a POST.
export default defineEventHandler(async (event) => {
  await rateLimit(`watch-link:${clientKey(event)}`, 120, 3_600_000, 'link look-ups from this connection', event)
  const { token } = readValidQuery(event, TokenSchema)
  return describeUnsubscribeLink(token)
})
