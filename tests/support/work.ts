import { vi } from 'vitest'
import { ApiClient } from './client'

/**
 * Resolves once every queued job and outlook on the server has finished (`GET /api/health`'s shared
 * work): after a change that queues background work, such as an upload that recomputes outlooks.
 */
export function workSettled(url: string) {
  return vi.waitFor(async () => {
    const { work } = (await new ApiClient(url).get('/api/health')).body
    if (work.jobsPending || work.outlooksRunning) throw new Error('still working')
  }, { timeout: 60_000, interval: 100 })
}
