import type { H3Event } from 'h3'
import { deepFreeze } from '../utils/deep-freeze'

// useRuntimeConfig(event) copies the whole runtime config and looks every one of its keys up in the
// environment again, once per request (178 keys, mostly nuxt-security's and i18n's: 0.7–0.9 ms of CPU
// a copy on a busy two-core host; the session and i18n ask for it on every request that is not a
// cached page). The environment does not change once the server has started, so one copy is made at
// the first request (after plugins such as security-runtime.ts have set theirs) and every request
// shares it. It is frozen, so code that tried to change it per request would fail loudly instead of
// leaking into other requests. Nitro offers no public way to do this: the copy is left in
// event.context.nitro.runtimeConfig, where useRuntimeConfig(event) looks first, a framework internal
// checked by tests/unit/server/shared-runtime-config-internals.test.ts.
export default defineNitroPlugin((nitroApp) => {
  let shared: ReturnType<typeof useRuntimeConfig> | undefined
  nitroApp.hooks.hook('request', (event) => {
    shared ??= deepFreeze(useRuntimeConfig({ context: { nitro: {} } } as unknown as H3Event))
    event.context.nitro ??= { errors: [] }
    event.context.nitro.runtimeConfig ??= shared
  })
})
