import { mkdtemp, writeFile, mkdir } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { dirname, join } from 'node:path'
import { databaseOptionsFromEnv, openDatabase, type DatabaseHandle } from '../db/client'
import { isEmpty, seedDemo } from '../db/seed/demo'

export * as tables from '../db/schema'

let ready: Promise<DatabaseHandle> | undefined

/** The database, migrated (and seeded with the demo coast when empty and SEED_DEMO allows). */
export async function useDb() {
  ready ??= start()
  return (await ready).db
}

export async function useDbHandle() {
  ready ??= start()
  return ready
}

async function start() {
  const handle = await openDatabase(databaseOptionsFromEnv())
  await handle.migrate(await materialiseMigrations())
  if (process.env.SEED_DEMO !== 'false' && await isEmpty(handle.db)) {
    await seedDemo(handle.db, hashPassword)
    console.info('[brinkwater] Empty database: seeded the illustrative demo coast.')
  }
  return handle
}

/**
 * drizzle's migrator reads a folder; in the built server the migrations are server assets,
 * so they are written out once to a private temporary folder first.
 */
async function materialiseMigrations() {
  const storage = useStorage('assets:migrations')
  const folder = await mkdtemp(join(tmpdir(), 'brinkwater-migrations-'))
  for (const key of await storage.getKeys()) {
    const path = join(folder, ...key.split(':'))
    await mkdir(dirname(path), { recursive: true })
    const raw = await storage.getItemRaw(key)
    await writeFile(path, typeof raw === 'string' ? raw : Buffer.from(raw as ArrayBuffer))
  }
  return folder
}
