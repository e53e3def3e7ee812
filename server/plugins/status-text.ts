import { STATUS_CODES } from 'node:http'

// An error made with only a status code and a message (createError({ statusCode: 403, message }))
// has no status text, and the error handler then says "Server Error" for every code: in the
// response's status line and in the JSON body a client may show. Each error gets the standard
// reason phrase of its code instead ("Forbidden", "Not Found"); its message is left as written.
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('error', (error) => {
    const failure = error as { statusCode?: number, statusMessage?: string }
    const code = failure.statusCode ?? 500
    if (!failure.statusMessage && code < 500) failure.statusMessage = STATUS_CODES[code]
  })
})
