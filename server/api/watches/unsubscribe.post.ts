import { TokenSchema } from '#shared/schemas/watches'
import { unsubscribe } from '~~/server/services/watches'

// One-click unsubscribe (RFC 8058): mail clients POST to the List-Unsubscribe address with the
// token in the query; the unsubscribe page sends it the same way.
export default defineEventHandler(async (event) => {
  await rateLimit(`unsubscribe:${clientKey(event)}`, 60, 3_600_000, 'unsubscribe attempts from this connection', event)
  const { token } = readValidQuery(event, TokenSchema)
  return unsubscribe(token)
})
