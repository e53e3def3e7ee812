// Stores a freshly rendered shared briefing page, with its headers and the nonce it was rendered
// with, once the renderer answered 200 (see server/utils/page-cache.ts for the rules).
export default defineNitroPlugin((nitroApp) => {
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
