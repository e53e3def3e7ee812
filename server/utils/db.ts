import { databaseOptionsFromEnv, openDatabase, type DatabaseHandle } from '../db/client'
import { isEmpty, seedDemo } from '../db/seed/demo'

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
  await handle.migrate(await materialiseAssets('migrations'))
  if (process.env.SEED_DEMO !== 'false' && await isEmpty(handle.db)) {
    await seedDemo(handle.db, hashPassword)
    console.info('[brinkwater] Empty database: seeded the illustrative demo coast.')
  }
  return handle
}
