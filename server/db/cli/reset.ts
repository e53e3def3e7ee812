// `npm run db:reset`: throws away the embedded database and recreates it with the demo coast.
import { rm } from 'node:fs/promises'
import { databaseOptionsFromEnv, openDatabase } from '../client'
import { hashPasswordOffline } from '../password'
import { seedDemo } from '../seed/demo'
import { MIGRATIONS_FOLDER } from './migrate'

async function main() {
  const options = databaseOptionsFromEnv()
  if (options.url) throw new Error('db:reset only recreates the embedded PGlite database; unset DATABASE_URL.')
  if (options.dataDir !== 'memory://') await rm(options.dataDir, { recursive: true, force: true })
  const handle = await openDatabase(options)
  try {
    await handle.migrate(MIGRATIONS_FOLDER)
    await seedDemo(handle.db, hashPasswordOffline)
    console.log(`Recreated ${handle.describe} with the illustrative demo data.`)
  }
  finally {
    await handle.close()
  }
}

main().catch((error) => {
  console.error(error instanceof Error ? error.message : error)
  process.exit(1)
})
