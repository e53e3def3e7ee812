// Cross-site request forgery: a state-changing API request (POST, PUT, PATCH, DELETE) must come
// from the app's own pages. We check the browser's own standard headers, as OWASP's CSRF guidance
// describes ("verifying origin with standard headers" and Fetch Metadata), rather than a token:
// - Sec-Fetch-Site, sent by every current browser and not settable by page scripts: only
//   'same-origin' (or 'none', a request the user made directly) passes;
// - otherwise Origin, which browsers send with every cross-origin and every non-GET request: it
//   must be the app's own origin (APP_URL, or the origin the request was addressed to).
// A request with neither header does not come from a browser (scripts, mail clients, our tests),
// and only browsers attach the ambient session cookie that forgery relies on, so it passes.
// A token scheme (nuxt-csurf) would need the token on every client fetch for no extra protection.
const STATE_CHANGING = new Set(['POST', 'PUT', 'PATCH', 'DELETE'])
// RFC 8058 one-click unsubscribe is posted by mail providers from their own sites; it carries its
// own token and no session, so there is nothing to forge.
const EXEMPT = new Set(['/api/watches/unsubscribe'])

const refuse = () => createError({
  statusCode: 403,
  message: 'This request came from another site, so it was refused. Open Brinkwater itself and try again there.',
})

export default defineEventHandler((event) => {
  if (!STATE_CHANGING.has(event.method) || !event.path.startsWith('/api/')) return
  if (EXEMPT.has(event.path.split('?')[0]!)) return

  const site = getRequestHeader(event, 'sec-fetch-site')
  if (site) {
    if (site === 'same-origin' || site === 'none') return
    throw refuse()
  }
  const origin = getRequestHeader(event, 'origin')
  if (origin === undefined) return
  const own = [
    new URL(appUrl()).origin,
    getRequestURL(event, { xForwardedHost: serverConfig().TRUST_PROXY, xForwardedProto: serverConfig().TRUST_PROXY })
      .origin,
  ]
  if (!own.includes(origin)) throw refuse()
})
