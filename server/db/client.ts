import type { PgDatabase, PgQueryResultHKT } from 'drizzle-orm/pg-core'
import { drizzle as drizzlePglite } from 'drizzle-orm/pglite'
import { migrate as migratePglite } from 'drizzle-orm/pglite/migrator'
import { drizzle as drizzleNodePg } from 'drizzle-orm/node-postgres'
import { migrate as migrateNodePg } from 'drizzle-orm/node-postgres/migrator'
import pg from 'pg'
import {
  DEFAULT_PGLITE_SHARED_BUFFERS,
  PGLITE_MEMORY_HINT,
  PGLITE_MEMORY_SETTING,
  serverConfig,
  type ServerConfig,
} from '../utils/config'
import { claimDataDir } from './data-dir-lock'
import { LeanPGlite } from './pglite-client'
import * as schema from './schema'

/**
 * The one database type routes see. Both drizzle's PGlite driver and node-postgres produce a
 * PgDatabase, so routes and services never know which one they run on.
 */
export type Database = PgDatabase<PgQueryResultHKT, typeof schema>

export type DatabaseKind = 'pglite' | 'postgresql'

export interface DatabaseHandle {
  db: Database
  kind: DatabaseKind
  /** Where the data lives, for logs; never contains a password. */
  describe: string
  migrate: (migrationsFolder: string) => Promise<void>
  /**
   * Runs `work` while no other app instance on the same database runs its own `exclusive` work,
   * so instances starting side by side do not migrate or seed twice.
   */
  exclusive: <T>(work: () => Promise<T>) => Promise<T>
  close: () => Promise<void>
}

export interface DatabaseOptions {
  /** A PostgreSQL server URL (DATABASE_URL). Unset: embedded PGlite. */
  url?: string
  /** PGlite data folder, or `memory://` for a throw-away database. */
  dataDir: string
  /** Most connections one app instance holds to a PostgreSQL server. */
  poolSize?: number
  /** PGlite's shared_buffers, a PostgreSQL memory setting such as `32MB` (PGLITE_SHARED_BUFFERS). */
  sharedBuffers?: string
}

/** Connections from the app carry this name, so `db:restore` can see whether the app is running. */
export const APPLICATION_NAME = 'brinkwater'
/** Any fixed number: the advisory lock instances take while migrating and seeding. */
const START_LOCK = 7_160_514_203

export async function openDatabase(options: DatabaseOptions): Promise<DatabaseHandle> {
  return options.url ? openServer(options.url, options.poolSize) : openPglite(options.dataDir, options.sharedBuffers)
}

/**
 * PGlite's buffer pool lives inside the app process and is touched as soon as the database opens, so
 * PostgreSQL's server default (128 MB, sized for a machine of its own) costs the app about 100 MB of
 * resident memory more than 32 MB does. An app's working set (sites, releases, the latest outlooks) fits
 * in 32 MB, and a page that misses is read from the operating system's file cache.
 */
export { DEFAULT_PGLITE_SHARED_BUFFERS }

async function openPglite(dataDir: string, sharedBuffers = DEFAULT_PGLITE_SHARED_BUFFERS): Promise<DatabaseHandle> {
  if (!PGLITE_MEMORY_SETTING.test(sharedBuffers)) {
    throw new Error(`PGLITE_SHARED_BUFFERS is "${sharedBuffers}": ${PGLITE_MEMORY_HINT}`)
  }
  const inMemory = dataDir === 'memory://'
  const release = inMemory ? async () => {} : await claimDataDir(dataDir)
  try {
    // PGlite's own start parameters, with the buffer pool set (startParams replaces them, so repeat them).
    const startParams = [...LeanPGlite.defaultStartParams, '-c', `shared_buffers=${sharedBuffers}`]
    const client = await LeanPGlite.open({ dataDir: inMemory ? undefined : dataDir, startParams })
    const db = drizzlePglite({ client, schema }) as unknown as Database
    return {
      db,
      kind: 'pglite',
      describe: inMemory ? 'PGlite (in memory)' : `PGlite (${dataDir})`,
      migrate: folder => migratePglite(drizzlePglite({ client, schema }), { migrationsFolder: folder }),
      // One process owns the folder (claimDataDir), so there is nobody to wait for.
      exclusive: work => work(),
      close: async () => {
        await client.close()
        await release()
      },
    }
  }
  catch (error) {
    await release()
    throw error
  }
}

async function openServer(url: string, poolSize = 10): Promise<DatabaseHandle> {
  // Two at least: `exclusive` holds one while migrating through another.
  const pool = new pg.Pool({
    connectionString: url,
    max: Math.max(2, poolSize),
    connectionTimeoutMillis: 10_000,
    application_name: APPLICATION_NAME,
  })
  // An idle connection the server drops must not crash the process; the next query reconnects.
  pool.on('error', error => console.error('[brinkwater] A pooled database connection failed:', error.message))
  const db = drizzleNodePg({ client: pool, schema }) as unknown as Database
  // Fail at start, with the reason, rather than on the first request.
  try {
    await pool.query('select 1')
  }
  catch (error) {
    await pool.end()
    throw new Error(
      `Could not connect to the PostgreSQL server at ${describeUrl(url)}: ${error instanceof Error ? error.message : error}`,
    )
  }
  return {
    db,
    kind: 'postgresql',
    describe: `PostgreSQL (${describeUrl(url)})`,
    migrate: folder => migrateNodePg(drizzleNodePg({ client: pool, schema }), { migrationsFolder: folder }),
    exclusive: async (work) => {
      const holder = await pool.connect()
      try {
        await holder.query('select pg_advisory_lock($1)', [START_LOCK])
        try {
          return await work()
        }
        finally {
          await holder.query('select pg_advisory_unlock($1)', [START_LOCK])
        }
      }
      finally {
        holder.release()
      }
    },
    close: () => pool.end(),
  }
}

/** `user@host:port/database`, without the password. */
export function describeUrl(url: string) {
  try {
    const parsed = new URL(url)
    const user = parsed.username ? `${decodeURIComponent(parsed.username)}@` : ''
    return `${user}${parsed.host}${parsed.pathname}`
  }
  catch {
    return 'an unreadable DATABASE_URL'
  }
}

type DatabaseSettings = Pick<
  ServerConfig,
  'DATABASE_URL' | 'PGLITE_DATA_DIR' | 'DATABASE_POOL_SIZE' | 'PGLITE_SHARED_BUFFERS'
>

/** The database the settings name (server/utils/config.ts): the app and the db:* commands alike. */
export function databaseOptions(config: DatabaseSettings = serverConfig()): DatabaseOptions {
  return {
    url: config.DATABASE_URL,
    dataDir: config.PGLITE_DATA_DIR,
    poolSize: config.DATABASE_POOL_SIZE,
    sharedBuffers: config.PGLITE_SHARED_BUFFERS,
  }
}
