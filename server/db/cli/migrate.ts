// `npm run db:migrate`: applies the committed migrations to the configured database.
import { fileURLToPath } from 'node:url'
import { databaseOptions, openDatabase } from '../client'

export const MIGRATIONS_FOLDER = fileURLToPath(new URL('../migrations', import.meta.url))

async function main() {
  const handle = await openDatabase(databaseOptions())
  try {
    await handle.migrate(MIGRATIONS_FOLDER)
    console.log(`Migrations applied to ${handle.describe}.`)
  }
  finally {
    await handle.close()
  }
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  main().catch((error) => {
    console.error(error instanceof Error ? error.message : error)
    process.exit(1)
  })
}
