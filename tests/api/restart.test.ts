import { existsSync, writeFileSync } from 'node:fs'
import { mkdtemp, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { ApiClient } from '../support/client'
import { PLANNER } from '../support/demo-users'
import { SITE_BODY } from '../support/matrix-fixtures'
import {
  createTestDatabase,
  startServer,
  TEST_DATABASE_URL,
  type RunningServer,
  type TestDatabase,
} from '../support/server'

// Two server starts on a file database (PGlite's first open creates it): generous on a busy machine.
const RESTART_TIMEOUT = 180_000

const plannerOn = (server: RunningServer) => ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)

/** Creates a site, stops the server with SIGTERM, starts a new one on the same data, reads it. */
async function survivesRestart(env: Record<string, string>) {
  const first = await startServer(env)
  let id: string
  try {
    const created = await (await plannerOn(first)).post('/api/sites', SITE_BODY('Restart Quay'))
    expect(created.status).toBe(201)
    id = created.body.id
  }
  finally {
    await first.stop()
  }
  const second = await startServer(env)
  try {
    const read = await (await plannerOn(second)).get(`/api/sites/${id}`)
    expect(read.status).toBe(200)
    expect(read.body).toMatchObject({ name: 'Restart Quay', landMotionRate: -2 })
    expect(read.body.thresholds.map((t: { label: string }) => t.label)).toEqual(['Quay'])
  }
  finally {
    await second.stop()
  }
}

describe('data survives a restart', () => {
  let folder: string
  beforeAll(async () => { folder = await mkdtemp(join(tmpdir(), 'brinkwater-restart-')) })
  afterAll(async () => { await rm(folder, { recursive: true, force: true }) })

  it('in a PGlite data folder', async () => {
    const dataDir = join(folder, 'pglite')
    await survivesRestart({ PGLITE_DATA_DIR: dataDir })
    // A clean stop hands the folder back.
    expect(existsSync(`${dataDir}.pid`)).toBe(false)
  }, RESTART_TIMEOUT)

  it('a second server on a PGlite folder in use exits non-zero saying why, and the first keeps working', async () => {
    const dataDir = join(folder, 'shared')
    const first = await startServer({ PGLITE_DATA_DIR: dataDir })
    try {
      const second = startServer({ PGLITE_DATA_DIR: dataDir }, { requireHealthy: false })
      await expect(second).rejects.toThrow(/exited with code 1 before listening[\s\S]*is in use by process \d+/)
      expect((await (await plannerOn(first)).get('/api/sites')).status).toBe(200)
    }
    finally {
      await first.stop()
    }
  }, RESTART_TIMEOUT)

  it('a PGlite folder that cannot be written stops the server with the reason', async () => {
    // A path under a plain file can never be created, for root too (a chmod would not stop root).
    const file = join(folder, 'not-a-folder')
    writeFileSync(file, '')
    await expect(startServer({ PGLITE_DATA_DIR: join(file, 'pglite') }, { requireHealthy: false }))
      .rejects.toThrow(/exited with code 1 before listening[\s\S]*cannot be created or written \(ENOTDIR\)/)
  }, RESTART_TIMEOUT)
})

// Only where a PostgreSQL server is given (CI's second API run); the PGlite cases always run.
if (TEST_DATABASE_URL) {
  describe('data survives a restart on a PostgreSQL server', () => {
    let database: TestDatabase
    beforeAll(async () => { database = await createTestDatabase() })
    afterAll(async () => { await database?.drop() })

    it('in a PostgreSQL database', async () => {
      await survivesRestart({ DATABASE_URL: database.url })
    }, RESTART_TIMEOUT)
  })
}
