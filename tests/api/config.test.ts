import { describe, expect, it } from 'vitest'
import { startServer } from '../support/server'

// The built server checks its environment before anything else (server/plugins/config.ts); the
// messages themselves are covered one by one in tests/unit/server/config.test.ts.
describe('settings the server cannot use', () => {
  it('stop the built server before it listens, exit code 1, naming each variable and what to give', async () => {
    const start = startServer({ MAIL_POLL_MS: 'soon', NUXT_SESSION_PASSWORD: '' }, { requireHealthy: false })
    await expect(start).rejects.toThrow(
      /exited with code 1 before listening[\s\S]*MAIL_POLL_MS is "soon": give a whole number of milliseconds, such as 2000\.[\s\S]*NUXT_SESSION_PASSWORD is not set/,
    )
  }, 60_000)
})
