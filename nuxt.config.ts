import { fileURLToPath } from 'node:url'

// Brinkwater keeps the classic top-level layout (no app/ folder): srcDir is the repository root.
export default defineNuxtConfig({
  compatibilityDate: '2026-11-01',
  srcDir: '.',
  modules: ['@pinia/nuxt', '@nuxtjs/tailwindcss', '@nuxtjs/i18n', 'nuxt-auth-utils'],
  tailwindcss: { cssPath: '~/assets/css/main.css' },
  devtools: { enabled: false },
  telemetry: false,

  app: {
    head: {
      titleTemplate: '%s · Brinkwater',
      meta: [{ name: 'viewport', content: 'width=device-width, initial-scale=1' }],
      link: [{ rel: 'icon', type: 'image/svg+xml', href: '/favicon.svg' }],
    },
  },

  i18n: {
    restructureDir: '.',
    langDir: 'locales',
    defaultLocale: 'en',
    strategy: 'no_prefix',
    locales: [
      // One file per domain, merged per language, so areas of the app keep their strings apart.
      { code: 'en', language: 'en-GB', name: 'English', files: ['en.json', 'en-sites.json', 'en-briefings.json', 'en-mail.json'] },
      { code: 'es', language: 'es-ES', name: 'Español', files: ['es.json', 'es-sites.json', 'es-briefings.json', 'es-mail.json'] },
    ],
    detectBrowserLanguage: { useCookie: true, cookieKey: 'brinkwater_locale', redirectOn: 'root' },
  },

  runtimeConfig: {
    // Overridden by NUXT_SESSION_PASSWORD; nuxt-auth-utils writes one to .env in development.
    session: { name: 'brinkwater-session', maxAge: 60 * 60 * 12 },
  },

  // The engine's seeded generator uses BigInt literals; Node.js 20 and current browsers have them.
  vite: { build: { target: 'es2022' } },

  nitro: {
    esbuild: { options: { target: 'es2022' } },
    // Files read at run time by the built server travel as server assets.
    serverAssets: [
      { baseName: 'migrations', dir: fileURLToPath(new URL('./server/db/migrations', import.meta.url)) },
      // The PDF embeds the app's own font; PDFKit reads .woff (its .woff2 renders blank).
      { baseName: 'fonts', dir: fileURLToPath(new URL('./node_modules/@fontsource/atkinson-hyperlegible/files', import.meta.url)), pattern: 'atkinson-hyperlegible-latin-*.woff' },
    ],
  },

  // echarts, zrender and vue-echarts ship ESM that must go through Vite's transform for SSR.
  build: { transpile: ['echarts', 'zrender', 'vue-echarts'] },

  typescript: { strict: true },
})
