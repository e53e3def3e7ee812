// `npm run db:backup [-- --out <file>]`: copies the configured database into backups/.
// PGlite: the whole data folder as a .tar.gz (the app must be stopped: one process per folder).
// PostgreSQL (DATABASE_URL): pg_dump's custom format, which pg_restore reads; the app may run.
import { existsSync } from 'node:fs'
import { readdir, stat, writeFile } from 'node:fs/promises'
import { fileURLToPath } from 'node:url'
import { PGlite } from '@electric-sql/pglite'
import { databaseOptions, describeUrl } from '../client'
import { claimDataDir, dataDirHolder } from '../data-dir-lock'
import { backupPath, parseArgs, runCli } from './backup-files'
import { runPgTool } from './pg-tools'

export async function backupPglite(dataDir: string, out?: string) {
  if (dataDir === 'memory://')
    throw new Error('PGLITE_DATA_DIR is memory://: an in-memory database has nothing on disk to back up.')
  if (!existsSync(dataDir) || !(await readdir(dataDir)).length) {
    throw new Error(
      `Nothing to back up: the PGlite data folder ${dataDir} does not exist or is empty. Set PGLITE_DATA_DIR to the folder the app uses.`,
    )
  }
  const holder = await dataDirHolder(dataDir)
  if (holder)
    throw new Error(
      `The app (process ${holder}) has ${dataDir} open. Stop the app first, then run npm run db:backup again.`,
    )
  const release = await claimDataDir(dataDir)
  try {
    const client = new PGlite(dataDir)
    try {
      // dumpDataDir before the database is ready never settles (and Node exits silently).
      await client.waitReady
      const archive = await client.dumpDataDir('gzip')
      const file = out ?? await backupPath('pglite')
      await writeFile(file, Buffer.from(await archive.arrayBuffer()))
      return file
    }
    finally {
      await client.close()
    }
  }
  finally {
    await release()
  }
}

export async function backupServer(url: string, out?: string) {
  const file = out ?? await backupPath('postgresql')
  await runPgTool('pg_dump', ['--format=custom', `--file=${file}`], url)
  return file
}

async function main() {
  const args = parseArgs()
  const options = databaseOptions()
  const file = options.url ? await backupServer(options.url, args.out) : await backupPglite(options.dataDir, args.out)
  const size = (await stat(file)).size
  console.log(
    `Backed up ${options.url ? `PostgreSQL (${describeUrl(options.url)})` : `PGlite (${options.dataDir})`} to ${file} (${(size / 1e6).toFixed(1)} MB).`,
  )
  console.log(`Restore it with: npm run db:restore -- ${file} --force`)
}

if (process.argv[1] === fileURLToPath(import.meta.url)) runCli(main)
