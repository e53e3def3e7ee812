import type { H3Event } from 'h3'
import { deepFreeze } from '../utils/deep-freeze'

// useRuntimeConfig(event) copies the whole runtime config and looks every key up in the environment
// again, once per request (1–2 ms of CPU per request under `npm run load`; the session and i18n ask
// for it on every request). The environment does not change once the server has started, so one
// copy is made at the first request (after plugins such as security-runtime.ts have set theirs) and
// every request shares it. It is frozen, so code that tried to change it per request would fail
// loudly instead of leaking into other requests.
export default defineNitroPlugin((nitroApp) => {
  let shared: ReturnType<typeof useRuntimeConfig> | undefined
  nitroApp.hooks.hook('request', (event) => {
    shared ??= deepFreeze(useRuntimeConfig({ context: { nitro: {} } } as unknown as H3Event))
    event.context.nitro ??= { errors: [] }
    event.context.nitro.runtimeConfig ??= shared
  })
})
