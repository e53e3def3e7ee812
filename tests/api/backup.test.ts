import { existsSync } from 'node:fs'
import { mkdtemp, readdir, rm } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { runDbCli } from '../support/cli'
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

// Three server starts and four command runs, each opening the database: generous on a busy machine.
const ROUND_TRIP_TIMEOUT = 240_000

const plannerOn = (server: RunningServer) => ApiClient.signedIn(server.url, PLANNER.email, PLANNER.password)

/** Runs `work` against a server started on the given database, then stops it. */
async function withServer<T>(env: Record<string, string>, work: (planner: ApiClient) => Promise<T>) {
  const server = await startServer(env)
  try {
    return await work(await plannerOn(server))
  }
  finally {
    await server.stop()
  }
}

/**
 * Backup, change, restore: a site created before the backup comes back as it was, and a site
 * created after it is gone. `env` selects the database for the server and the scripts alike.
 */
async function roundTrip(env: Record<string, string>, backupDir: string, refusedWhileRunning: RegExp) {
  const cliEnv = { ...env, BACKUP_DIR: backupDir }
  const kept = await withServer(env, async (planner) => {
    const created = await planner.post('/api/sites', SITE_BODY('Backup Harbour'))
    expect(created.status).toBe(201)
    return created.body.id as string
  })

  const backup = await runDbCli('backup', [], cliEnv)
  expect(backup.stderr).toBe('')
  expect(backup.code).toBe(0)
  const [file] = await readdir(backupDir)
  expect(file).toMatch(/^brinkwater-\d{4}-\d\d-\d\dT\d\d-\d\d-\d\dZ\.(tar\.gz|dump)$/)
  const backupFile = join(backupDir, file!)

  const server = await startServer(env)
  let later: string
  try {
    const planner = await plannerOn(server)
    expect((await planner.patch(`/api/sites/${kept}`, SITE_BODY('Renamed after the backup'))).status).toBe(200)
    const created = await planner.post('/api/sites', SITE_BODY('Built after the backup'))
    expect(created.status).toBe(201)
    later = created.body.id

    // The app is running: the restore refuses and says what to do.
    const refused = await runDbCli('restore', [backupFile], cliEnv)
    expect(refused.code).toBe(1)
    expect(refused.stderr).toMatch(refusedWhileRunning)
  }
  finally {
    await server.stop()
  }

  // Stopped, but the database holds data: replacing it needs --force.
  const unforced = await runDbCli('restore', [backupFile], cliEnv)
  expect(unforced.code).toBe(1)
  expect(unforced.stderr).toContain('--force')

  const restored = await runDbCli('restore', [backupFile, '--force'], cliEnv)
  expect(restored.stderr).toBe('')
  expect(restored.code).toBe(0)
  expect(restored.stdout).toContain('What was there before is kept in')

  await withServer(env, async (planner) => {
    const back = await planner.get(`/api/sites/${kept}`)
    expect(back.status).toBe(200)
    expect(back.body).toMatchObject({ name: 'Backup Harbour', landMotionRate: -2 })
    expect((await planner.get(`/api/sites/${later}`)).status).toBe(404)
  })
}

describe('backup and restore', () => {
  let folder: string
  beforeAll(async () => { folder = await mkdtemp(join(tmpdir(), 'brinkwater-backup-')) })
  afterAll(async () => { await rm(folder, { recursive: true, force: true }) })

  it('round-trips a PGlite data folder, keeping the replaced folder aside', async () => {
    const dataDir = join(folder, 'pglite')
    await roundTrip({ PGLITE_DATA_DIR: dataDir }, join(folder, 'pglite-backups'), /Stop the app first/)
    const beside = await readdir(folder)
    expect(beside.some(name => name.startsWith('pglite.before-restore-'))).toBe(true)
  }, ROUND_TRIP_TIMEOUT)

  it('refuses a file that is not a backup, and leaves the folder as it was', async () => {
    const dataDir = join(folder, 'untouched')
    const result = await runDbCli('restore', [join(import.meta.dirname, 'backup.test.ts'), '--force'], {
      PGLITE_DATA_DIR: dataDir,
    })
    expect(result.code).toBe(1)
    expect(result.stderr).toContain('is not a PGlite backup')
    expect(existsSync(dataDir)).toBe(false)
  })

  it('says what to set when there is nothing to back up', async () => {
    const result = await runDbCli('backup', [], {
      PGLITE_DATA_DIR: join(folder, 'missing'),
      BACKUP_DIR: join(folder, 'none'),
    })
    expect(result.code).toBe(1)
    expect(result.stderr).toContain('Set PGLITE_DATA_DIR')
  })
})

if (TEST_DATABASE_URL) {
  describe('backup and restore on a PostgreSQL server', () => {
    let folder: string
    let database: TestDatabase
    beforeAll(async () => {
      folder = await mkdtemp(join(tmpdir(), 'brinkwater-backup-pg-'))
      database = await createTestDatabase()
    })
    afterAll(async () => {
      await database?.drop()
      await rm(folder, { recursive: true, force: true })
    })

    it('round-trips a database with pg_dump and pg_restore, dumping the replaced data first', async () => {
      const backupDir = join(folder, 'backups')
      await roundTrip({ DATABASE_URL: database.url }, backupDir, /Stop every app instance first/)
      expect((await readdir(backupDir)).some(name => name.startsWith('brinkwater-before-restore-'))).toBe(true)
    }, ROUND_TRIP_TIMEOUT)
  })
}
