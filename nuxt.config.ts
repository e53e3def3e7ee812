import { fileURLToPath } from 'node:url'
import { LANGUAGES, PAGE_DOMAINS } from './locales'

// Brinkwater keeps the classic top-level layout (no app/ folder): srcDir is the repository root.

export default defineNuxtConfig({
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', '@nuxtjs/i18n', 'nuxt-auth-utils', 'nuxt-security'],
  devtools: { enabled: false },

  app: {
    head: {
      titleTemplate: '%s · Brinkwater',
      meta: [{ name: 'viewport', content: 'width=device-width, initial-scale=1' }],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },

  runtimeConfig: {
    // Overridden by NUXT_SESSION_PASSWORD; nuxt-auth-utils writes one to .env in development.
    // httpOnly and SameSite=Lax always; Secure is set at start from APP_URL (server/plugins/security-runtime.ts).
    session: {
      name: 'brinkwater-session',
      maxAge: 60 * 60 * 12,
      cookie: { httpOnly: true, sameSite: 'lax', secure: false },
    },
  },
  srcDir: '.',

  // echarts, zrender and vue-echarts ship ESM that must go through Vite's transform for SSR.
  build: { transpile: ['echarts', 'zrender', 'vue-echarts'] },
  compatibilityDate: '2026-11-01',

  nitro: {
    esbuild: { options: { target: 'es2022' } },
    // Files read at run time by the built server travel as server assets.
    serverAssets: [
      { baseName: 'migrations', dir: fileURLToPath(new URL('./server/db/migrations', import.meta.url)) },
      // The PDF embeds the app's own font; PDFKit reads .woff (its .woff2 renders blank).
      {
        baseName: 'fonts',
        dir: fileURLToPath(new URL('./node_modules/@fontsource/atkinson-hyperlegible/files', import.meta.url)),
        pattern: 'atkinson-hyperlegible-latin-*.woff',
      },
    ],
  },

  // The engine's seeded generator uses BigInt literals; Node.js 20 and current browsers have them.
  vite: { build: { target: 'es2022' } },

  typescript: { strict: true },
  telemetry: false,

  i18n: {
    restructureDir: '.',
    langDir: 'locales',
    defaultLocale: 'en',
    strategy: 'no_prefix',
    // Each language is a folder (locales/<code>/, listed in locales/index.ts) with one file per area of
    // the app, merged per language so areas keep their strings apart.
    locales: LANGUAGES.map(({ code, language, name }) => ({
      code,
      language,
      name,
      files: PAGE_DOMAINS.map(domain => `${code}/${domain}.json`),
    })),
    detectBrowserLanguage: { useCookie: true, cookieKey: 'brinkwater_locale', redirectOn: 'root' },
  },

  // Response headers and a nonce-based content security policy. The parts of nuxt-security that would
  // fight the app are off: routes validate their own input and escape output (xssValidator), readValidBody
  // answers 413 for bodies over 12 MB (requestSizeLimiter allows 2 MB), and server/utils/rate-limit.ts
  // limits the routes that need it (rateLimiter would count every asset request).
  security: {
    nonce: true,
    // Every <script>, <style> and <link> the server renders carries a fresh nonce per response; the
    // shared-briefing page cache (server/utils/page-cache.ts) swaps in a new one each time it serves.
    headers: {
      contentSecurityPolicy: {
        'default-src': ['\'self\''],
        // The entry script is allowed by its nonce and loads the rest ('strict-dynamic'); 'self' is for
        // browsers without CSP 3. No 'unsafe-eval': neither Vue's runtime build nor ECharts needs it.
        'script-src': ['\'self\'', '\'nonce-{{nonce}}\'', '\'strict-dynamic\''],
        'script-src-attr': ['\'none\''],
        // ECharts, MapLibre and Vue's :style bindings write inline styles; a nonce here would cancel
        // 'unsafe-inline', so styles are limited by origin only (img-src keeps CSS from fetching elsewhere).
        'style-src': ['\'self\'', '\'unsafe-inline\''],
        // MapLibre starts its worker from the app's own URL (setWorkerUrl); blob: for its fallback.
        'worker-src': ['\'self\'', 'blob:'],
        'child-src': ['\'self\'', 'blob:'],
        'img-src': ['\'self\'', 'data:', 'blob:'],
        'font-src': ['\'self\''],
        'connect-src': ['\'self\''],
        'manifest-src': ['\'self\''],
        'media-src': ['\'none\''],
        'frame-src': ['\'none\''],
        'object-src': ['\'none\''],
        'base-uri': ['\'none\''],
        'frame-ancestors': ['\'none\''],
        'form-action': ['\'self\''],
        // Turned on at start when APP_URL is https (server/plugins/security-runtime.ts): on plain-http
        // loopback it would send the browser to an https port that does not exist.
        'upgrade-insecure-requests': false,
      },
      crossOriginOpenerPolicy: 'same-origin',
      crossOriginResourcePolicy: 'same-origin',
      // Nothing needs cross-origin isolation (no SharedArrayBuffer); leave embedding rules to CORP.
      crossOriginEmbedderPolicy: false,
      referrerPolicy: 'strict-origin-when-cross-origin',
      xContentTypeOptions: 'nosniff',
      xFrameOptions: 'DENY',
      // Also set at start from APP_URL: HSTS means nothing over http and would pin a test host to https.
      strictTransportSecurity: false,
      permissionsPolicy: {
        'camera': [],
        'microphone': [],
        'geolocation': [],
        'display-capture': [],
        'payment': [],
        'usb': [],
        'fullscreen': [],
      },
    },
    xssValidator: false,
    requestSizeLimiter: false,
    // The API serves the app's own pages only: no CORS headers, so other sites cannot read answers.
    corsHandler: false,
    rateLimiter: false,
    // Keep console output: server logs matter, and the browser tests read the console.
    removeLoggers: false,
  },
  tailwindcss: { cssPath: '~/assets/css/main.css' },
})
