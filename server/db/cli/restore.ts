// `npm run db:restore -- <file> [--force]`: replaces the configured database with a backup made
// by `npm run db:backup`. Stop the app first. What is replaced is kept: a PGlite folder is moved
// aside, a PostgreSQL database is dumped into backups/ before pg_restore runs.
import { existsSync } from 'node:fs'
import { open, readdir, readFile, rename, rm } from 'node:fs/promises'
import { fileURLToPath } from 'node:url'
import { PGlite } from '@electric-sql/pglite'
import pg from 'pg'
import { APPLICATION_NAME, databaseOptions, describeUrl } from '../client'
import { claimDataDir, dataDirHolder } from '../data-dir-lock'
import { backupFolder, backupPath, parseArgs, runCli, timestamp } from './backup-files'
import { backupServer } from './backup'
import { runPgTool } from './pg-tools'

const USAGE = 'Usage: npm run db:restore -- <backup file> [--force]'

async function startsWith(file: string, magic: Buffer) {
  const handle = await open(file, 'r')
  try {
    const head = Buffer.alloc(magic.length)
    await handle.read(head, 0, magic.length, 0)
    return head.equals(magic)
  }
  finally {
    await handle.close()
  }
}

const GZIP = Buffer.from([0x1F, 0x8B])
const PG_CUSTOM_DUMP = Buffer.from('PGDMP')

export async function restorePglite(file: string, dataDir: string, force: boolean) {
  if (dataDir === 'memory://')
    throw new Error('PGLITE_DATA_DIR is memory://: set it to the folder the app uses, then restore into it.')
  if (!(await startsWith(file, GZIP)))
    throw new Error(
      `${file} is not a PGlite backup (.tar.gz from npm run db:backup). ${(await startsWith(file, PG_CUSTOM_DUMP)) ? 'It is a PostgreSQL dump: set DATABASE_URL to restore it into a PostgreSQL server.' : ''}`.trim(),
    )
  const holder = await dataDirHolder(dataDir)
  if (holder)
    throw new Error(`The app (process ${holder}) has ${dataDir} open. Stop the app first, then run the restore again.`)
  const occupied = existsSync(dataDir) && (await readdir(dataDir)).length > 0
  const keptAs = `${dataDir}.before-restore-${timestamp()}`
  if (occupied && !force) {
    throw new Error(
      `${dataDir} already holds a database. Restoring replaces it: stop the app, then run the restore again with --force (the current folder is kept as ${dataDir}.before-restore-<time>).`,
    )
  }
  const release = await claimDataDir(dataDir)
  try {
    if (occupied) await rename(dataDir, keptAs)
    try {
      const client = new PGlite(dataDir, { loadDataDir: new Blob([await readFile(file)]) })
      await client.waitReady
      await client.query('select 1')
      await client.close()
    }
    catch (error) {
      // Put back what was there, so a bad backup file loses nothing.
      await rm(dataDir, { recursive: true, force: true })
      if (occupied) await rename(keptAs, dataDir)
      throw new Error(
        `${file} could not be restored: ${error instanceof Error ? error.message : error}. ${dataDir} is unchanged.`,
      )
    }
  }
  finally {
    await release()
  }
  return occupied ? keptAs : undefined
}

async function serverState(url: string) {
  const client = new pg.Client({ connectionString: url })
  await client.connect()
  try {
    const apps = await client.query<{ n: number }>(
      'select count(*)::int as n from pg_stat_activity where datname = current_database() and application_name = $1 and pid <> pg_backend_pid()',
      [APPLICATION_NAME],
    )
    const tables = await client.query<{ n: number }>(
      `select count(*)::int as n from information_schema.tables where table_schema in ('public', 'drizzle')`,
    )
    return { appConnections: apps.rows[0]!.n, tables: tables.rows[0]!.n }
  }
  finally {
    await client.end()
  }
}

export async function restoreServer(file: string, url: string, force: boolean) {
  if (!(await startsWith(file, PG_CUSTOM_DUMP)))
    throw new Error(
      `${file} is not a PostgreSQL backup (pg_dump custom format from npm run db:backup). ${(await startsWith(file, GZIP)) ? 'It is a PGlite backup: unset DATABASE_URL to restore it into a PGlite folder.' : ''}`.trim(),
    )
  const where = describeUrl(url)
  const state = await serverState(url)
  if (state.appConnections > 0 && !force) {
    throw new Error(
      `The app is connected to ${where} (${state.appConnections} connections). Stop every app instance first, then run the restore again (--force restores anyway).`,
    )
  }
  if (state.tables > 0 && !force) {
    throw new Error(
      `${where} already holds data. Restoring replaces it: stop the app, then run the restore again with --force (the current data is dumped into ${backupFolder()} first).`,
    )
  }
  const keptAs
    = state.tables > 0 ? await backupServer(url, await backupPath('postgresql', 'brinkwater-before-restore')) : undefined
  // One transaction: a failed restore leaves the database as it was.
  await runPgTool(
    'pg_restore',
    ['--clean', '--if-exists', '--no-owner', '--single-transaction', '--exit-on-error', file],
    url,
  )
  return keptAs
}

async function main() {
  const args = parseArgs()
  const file = args.positional[0]
  if (!file || args.positional.length > 1) throw new Error(USAGE)
  if (!existsSync(file)) throw new Error(`${file} does not exist. ${USAGE}`)
  const options = databaseOptions()
  const keptAs = options.url
    ? await restoreServer(file, options.url, args.force)
    : await restorePglite(file, options.dataDir, args.force)
  console.log(
    `Restored ${file} into ${options.url ? `PostgreSQL (${describeUrl(options.url)})` : `PGlite (${options.dataDir})`}.`,
  )
  if (keptAs) console.log(`What was there before is kept in ${keptAs}.`)
  console.log('Start the app again; it applies any newer migrations at start.')
}

if (process.argv[1] === fileURLToPath(import.meta.url)) runCli(main)
