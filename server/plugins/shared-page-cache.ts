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
    if (!key) return
    if (getResponseStatus(event) === 200 && typeof response.body === 'string') {
      const headers = Object.fromEntries(Object.entries(getResponseHeaders(event))
        .filter((entry): entry is [string, string] => typeof entry[1] === 'string'))
      if (headers['content-type']?.startsWith('text/html')) {
        storeSharedPage(key, response.body, headers, event.context.security?.nonce ?? '')
        setResponseHeader(event, 'x-page-cache', 'miss')
      }
    }
    event.context.sharedPageRendered?.()
  })
  // Whatever happened to the render (an error, a closed connection), let waiting readers go on.
  nitroApp.hooks.hook('afterResponse', event => event.context.sharedPageRendered?.())
  nitroApp.hooks.hook('error', (_error, { event }) => event?.context.sharedPageRendered?.())
})

// Pages being rendered now, by key: a burst of readers arriving before the first render finished
// waits for it instead of rendering the same page hundreds of times over.
const rendering = new Map<string, Promise<void>>()
const RENDER_WAIT_MS = 5000

/** Answers from the cache when it may (true); otherwise lets the app render (false). */
async function serveStoredPage(event: H3Event) {
  const token = cacheableSharedToken(event)
  if (!token) return false
  const key = sharedPageKey(event, token)
  let page = cachedSharedPage(key)
  const inFlight = rendering.get(key)
  if (!page && inFlight) {
    await Promise.race([inFlight, new Promise(resolve => setTimeout(resolve, RENDER_WAIT_MS).unref())])
    page = cachedSharedPage(key)
  }
  const live = page && await shareIsLive(token)
  if (!page || !live || live.outlookAt >= page.storedAt) {
    // A revoked link is forgotten and rendered as "no longer shared" (404) by the app; a page older
    // than the site's latest outlook is rendered again, since it may now be out of date.
    if (page) forgetSharedPages(token)
    if (!rendering.has(key)) {
      let done!: () => void
      const render = new Promise<void>((resolve) => { done = resolve })
      rendering.set(key, render)
      event.context.sharedPageRendered = () => {
        if (rendering.get(key) === render) rendering.delete(key)
        done()
      }
    }
    event.context.sharedPageKey = key
    return false
  }
  // The same nonce format as nuxt-security's: 16 random bytes, base64.
  const { chunks, length, headers } = withFreshNonce(page, randomBytes(16).toString('base64'), acceptsGzip(event))
  setResponseHeaders(event, headers)
  setResponseHeader(event, 'x-page-cache', 'hit')
  setResponseHeader(event, 'content-length', length)
  // Straight to the socket (h3's send() waits a turn of the event loop first), the pieces corked into
  // one write; end() uncorks.
  const response = event.node.res
  response.cork()
  for (const chunk of chunks) response.write(chunk)
  response.end()
  return true
}
