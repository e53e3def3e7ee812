import { randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'

// The shared briefing page cache (rules in server/utils/page-cache.ts), in two halves:
// - serving sits in front of the whole app, as a caching reverse proxy would: a hit is answered
//   before Nitro's request hooks run (i18n and nuxt-security set up each request there, about
//   1.5 ms of CPU that a stored page does not need), so hundreds of readers cost little;
// - storing happens once the renderer has answered 200, with the headers and nonce it sent.
export default defineNitroPlugin((nitroApp) => {
  const app = nitroApp.h3App
  const handleRequest = app.handler
  app.handler = async (event: H3Event) => {
    if (!(await serveStoredPage(event))) return handleRequest(event)
  }

  nitroApp.hooks.hook('beforeResponse', (event, response) => {
    const key = event.context.sharedPageKey as string | undefined
    if (!key || getResponseStatus(event) !== 200 || typeof response.body !== 'string') return
    const headers = Object.fromEntries(Object.entries(getResponseHeaders(event))
      .filter((entry): entry is [string, string] => typeof entry[1] === 'string'))
    if (!headers['content-type']?.startsWith('text/html')) return
    storeSharedPage(key, response.body, headers, event.context.security?.nonce ?? '')
    setResponseHeader(event, 'x-page-cache', 'miss')
  })
})

/** Answers from the cache when it may (true); otherwise marks the request for storing (false). */
async function serveStoredPage(event: H3Event) {
  const token = cacheableSharedToken(event)
  if (!token) return false
  const key = sharedPageKey(event, token)
  const page = cachedSharedPage(key)
  if (!page || !(await shareIsLive(token))) {
    // A revoked link is forgotten and rendered as "no longer shared" (404) by the app.
    if (page) forgetSharedPages(token)
    event.context.sharedPageKey = key
    return false
  }
  // The same nonce format as nuxt-security's: 16 random bytes, base64.
  const { body, headers } = withFreshNonce(page, randomBytes(16).toString('base64'))
  setResponseHeaders(event, headers)
  setResponseHeader(event, 'x-page-cache', 'hit')
  await send(event, body)
  return true
}
