import { mkdir } from 'node:fs/promises'
import { PGlite } from '@electric-sql/pglite'
import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core'
import { drizzle } from 'drizzle-orm/pglite'
import { migrate } from 'drizzle-orm/pglite/migrator'
import * as schema from './schema'

/**
 * The one database type routes see. Both drizzle's PGlite driver and (later) node-postgres
 * produce a PgDatabase, so a PostgreSQL server can be plugged in here without touching routes.
 */
export type Database = PgDatabase<PgQueryResultHKT, typeof schema>

export interface DatabaseHandle {
  db: Database
  /** Where the data lives, for logs and the health check; never contains a password. */
  describe: string
  migrate: (migrationsFolder: string) => Promise<void>
  close: () => Promise<void>
}

export interface DatabaseOptions {
  /** A PostgreSQL server URL (DATABASE_URL). Unset: embedded PGlite. */
  url?: string
  /** PGlite data folder, or `memory://` for a throw-away database. */
  dataDir: string
}

export async function openDatabase(options: DatabaseOptions): Promise<DatabaseHandle> {
  if (options.url) {
    throw new Error('DATABASE_URL is set, but this build only runs on embedded PGlite. Unset DATABASE_URL to use PGlite under PGLITE_DATA_DIR.')
  }
  const inMemory = options.dataDir === 'memory://'
  if (!inMemory) await mkdir(options.dataDir, { recursive: true })
  const client = inMemory ? new PGlite() : new PGlite(options.dataDir)
  await client.waitReady
  const db = drizzle({ client, schema }) as unknown as Database
  return {
    db,
    describe: inMemory ? 'PGlite (in memory)' : `PGlite (${options.dataDir})`,
    migrate: folder => migrate(drizzle({ client, schema }), { migrationsFolder: folder }),
    close: () => client.close(),
  }
}

export const DEFAULT_DATA_DIR = '.data/pglite'

export function databaseOptionsFromEnv(env: NodeJS.ProcessEnv = process.env): DatabaseOptions {
  return { url: env.DATABASE_URL || undefined, dataDir: env.PGLITE_DATA_DIR || DEFAULT_DATA_DIR }
}
