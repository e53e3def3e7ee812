// Settings that depend on where the app runs, decided once at start from APP_URL: over https
// the session cookie is Secure, browsers are told to stay on https (HSTS) and to upgrade stray http
// requests; over plain http (loopback, a test host) those would break sign-in or send the browser to
// a port that does not exist.
export default defineNitroPlugin((nitroApp) => {
  const { APP_URL, NUXT_SESSION_COOKIE_SECURE } = serverConfig()
  // nuxt-auth-utils and i18n read these from the runtime config, which Nitro builds from the
  // environment's NUXT_* variables (its documented override): hand them the checked values.
  process.env.NUXT_SESSION_COOKIE_SECURE = String(NUXT_SESSION_COOKIE_SECURE)
  // i18n builds the page's language links from its base URL (and warns in every page's console
  // without one): the app's configured address, like every other link the app prints.
  process.env.NUXT_PUBLIC_I18N_BASE_URL ??= APP_URL

  if (!APP_URL.startsWith('https:')) return
  nitroApp.hooks.hook('nuxt-security:routeRules', (rules) => {
    const all = rules['/**'] ??= {}
    const headers = all.headers ||= {}
    headers.strictTransportSecurity = { maxAge: 31_536_000, includeSubdomains: true }
    if (headers.contentSecurityPolicy) headers.contentSecurityPolicy['upgrade-insecure-requests'] = true
  })
})
