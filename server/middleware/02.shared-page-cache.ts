// Serves a shared briefing page from the page cache (server/utils/page-cache.ts) when it may; the
// renderer handles everything else, and server/plugins/shared-page-cache.ts stores what it renders.
export default defineEventHandler(async (event) => {
  const token = cacheableSharedToken(event)
  if (!token) return
  const key = sharedPageKey(event, token)
  const page = cachedSharedPage(key)
  if (!page) {
    event.context.sharedPageKey = key
    return
  }
  if (!(await shareIsLive(token))) {
    // Revoked: forget it and let the page render its "no longer shared" answer with a 404.
    forgetSharedPages(token)
    return
  }
  const { body, headers } = withFreshNonce(page, event.context.security?.nonce)
  setResponseHeaders(event, headers)
  setResponseHeader(event, 'x-page-cache', 'hit')
  return body
})
