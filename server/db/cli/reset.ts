// `npm run db:reset`: throws the database away and recreates it with the demo coast.
// PGlite: deletes the data folder. PostgreSQL (DATABASE_URL): drops the app's schemas, and only
// with --force, since a server database may hold work that is not demo data.
import { rm } from 'node:fs/promises'
import { sql } from 'drizzle-orm'
import { databaseOptions, describeUrl, openDatabase } from '../client'
import { dataDirHolder } from '../data-dir-lock'
import { hashPasswordOffline } from '../password'
import { seedDemo } from '../seed/demo'
import { parseArgs, runCli } from './backup-files'
import { MIGRATIONS_FOLDER } from './migrate'

async function main() {
  const args = parseArgs()
  const options = databaseOptions()
  if (options.url && !args.force) {
    throw new Error(
      `db:reset deletes every table in ${describeUrl(options.url)}. Back it up first (npm run db:backup) if it matters, then run: npm run db:reset -- --force`,
    )
  }
  if (!options.url && options.dataDir !== 'memory://') {
    const holder = await dataDirHolder(options.dataDir)
    if (holder)
      throw new Error(
        `The app (process ${holder}) has ${options.dataDir} open. Stop the app first, then run npm run db:reset again.`,
      )
    await rm(options.dataDir, { recursive: true, force: true })
  }
  const handle = await openDatabase(options)
  try {
    await handle.exclusive(async () => {
      if (handle.kind === 'postgresql') {
        await handle.db.execute(sql`drop schema if exists drizzle cascade`)
        await handle.db.execute(sql`drop schema if exists public cascade`)
        await handle.db.execute(sql`create schema public`)
      }
      await handle.migrate(MIGRATIONS_FOLDER)
      await seedDemo(handle.db, hashPasswordOffline)
    })
    console.log(`Recreated ${handle.describe} with the illustrative demo data.`)
  }
  finally {
    await handle.close()
  }
}

runCli(main)
