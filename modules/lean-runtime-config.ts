import { defineNuxtModule } from 'nuxt/kit'

// nuxt-auth-utils fills runtimeConfig.oauth with settings for some forty OAuth providers (about 250
// keys). Brinkwater signs in with e-mail and password only, and @nuxtjs/i18n copies the runtime
// config and overlays the environment on it for every request, so those unused keys cost each
// request about a millisecond of CPU (measured with `npm run load`). Drop them once modules are set up.
export default defineNuxtModule({
  meta: { name: 'lean-runtime-config' },
  setup(_options, nuxt) {
    nuxt.hook('modules:done', () => {
      delete (nuxt.options.runtimeConfig as Record<string, unknown>).oauth
    })
  },
})
