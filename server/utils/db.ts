import { databaseOptions, openDatabase, type DatabaseHandle } from '../db/client'
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
  const handle = await openDatabase(databaseOptions())
  try {
    const migrations = await materialiseAssets('migrations')
    // Instances starting side by side on one server take turns, so only the first seeds.
    await handle.exclusive(async () => {
      await handle.migrate(migrations)
      if (serverConfig().SEED_DEMO && await isEmpty(handle.db)) {
        await seedDemo(handle.db, hashPassword)
        console.info('[brinkwater] Empty database: seeded the illustrative demo coast.')
      }
    })
  }
  catch (error) {
    await handle.close().catch(() => {})
    throw error
  }
  console.info(`[brinkwater] Database: ${handle.describe}.`)
  return handle
}
