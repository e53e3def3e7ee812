import { WatchRequestSchema } from '#shared/schemas/watches'
import { requestWatch } from '~~/server/services/watches'

const HOUR = 3_600_000

// Anyone may ask to watch a site (by a shared briefing's link, or by id when signed in): the
// answer is always "check your inbox", and nothing happens until the e-mail is confirmed.
export default defineEventHandler(async (event) => {
  const user = await optionalUser(event)
  await rateLimit(`watch:client:${clientKey(event)}`, 20, HOUR, 'watch requests from this connection', event)
  const request = await readValidBody(event, WatchRequestSchema)
  await rateLimit(`watch:email:${request.email}`, 5, HOUR, 'watch requests for this address', event)
  await requestWatch(request, user)
  setResponseStatus(event, 202)
  return { message: 'Check your inbox: follow the link in the e-mail to start the watch.' }
})
