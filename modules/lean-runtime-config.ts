import { defineNuxtModule, useLogger } from 'nuxt/kit'

// nuxt-auth-utils fills runtimeConfig.oauth with settings for some forty OAuth providers (about 250
// keys). Brinkwater signs in with e-mail and password only, and @nuxtjs/i18n and the session copy the
// runtime config and overlay the environment on it for every request, so those unused keys cost each
// request about a millisecond of CPU (measured with `npm run load`). Drop them once modules are set up,
// through Nuxt's public options; say so at build if there is nothing left to drop (a module upgrade
// moved them), so the cost does not come back unnoticed.
export default defineNuxtModule({
  meta: { name: 'lean-runtime-config' },
  setup(_options, nuxt) {
    nuxt.hook('modules:done', () => {
      const runtimeConfig = nuxt.options.runtimeConfig as Record<string, unknown>
      if (!('oauth' in runtimeConfig)) {
        useLogger('lean-runtime-config').warn(
          'nuxt-auth-utils added no runtimeConfig.oauth to drop: check where its provider settings went (modules/lean-runtime-config.ts).',
        )
        return
      }
      delete runtimeConfig.oauth
    })
  },
})
