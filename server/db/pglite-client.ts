import { PGlite, type PGliteOptions, type QueryOptions, type Results, type Transaction } from '@electric-sql/pglite'

/**
 * drizzle's PGlite session leaves dates, timestamps, intervals, numeric arrays and date-time arrays as
 * text by passing its own parsers with every query, and PGlite merges them into its map of about 320
 * type parsers on each call: a fresh 300-key object per query. Under a crowd of readers that was close
 * to half of everything the server allocated (a sampled heap profile during `npm run load`), and the
 * garbage, held while requests waited, was what pushed the server's memory up.
 *
 * So the same text parsers are installed once in the client, and a query whose own parsers are only
 * those runs without them. A query that brings any other parser keeps them all.
 */
const TEXT_AS_IS = [
  1114, // timestamp
  1184, // timestamp with time zone
  1186, // interval
  1082, // date
  1231, // numeric[]
  1115, // timestamp[]
  1185, // timestamp with time zone[]
  1187, // interval[]
  1182, // date[]
] as const
const installed = new Set<number>(TEXT_AS_IS)
const asIs = (value: string) => value

function withoutInstalledParsers(options?: QueryOptions): QueryOptions | undefined {
  if (!options?.parsers) return options
  for (const type of Object.keys(options.parsers)) {
    if (!installed.has(Number(type))) return options
  }
  const { parsers: _installed, ...rest } = options
  return rest
}

/** A transaction's own handle, with the same treatment of its queries. */
function leanTransaction(tx: Transaction): Transaction {
  return {
    query: (query, params, options) => tx.query(query, params, withoutInstalledParsers(options)),
    sql: (strings, ...params) => tx.sql(strings, ...params),
    exec: (query, options) => tx.exec(query, options),
    rollback: () => tx.rollback(),
    listen: (channel, callback) => tx.listen(channel, callback),
    get closed() { return tx.closed },
  }
}

export class LeanPGlite extends PGlite {
  override query<T>(query: string, params?: unknown[], options?: QueryOptions): Promise<Results<T>> {
    return super.query<T>(query, params, withoutInstalledParsers(options))
  }

  override transaction<T>(callback: (tx: Transaction) => Promise<T>): Promise<T> {
    return super.transaction(tx => callback(leanTransaction(tx)))
  }

  /** PGlite rebuilds its array parsers here, over the installed ones. */
  override async refreshArrayTypes(): Promise<void> {
    await super.refreshArrayTypes()
    this.installTextParsers()
  }

  private installTextParsers() {
    for (const type of TEXT_AS_IS) this.parsers[type] = asIs
  }

  /** Opens the database and installs the text parsers (after PGlite has built its array parsers). */
  static async open(options: PGliteOptions): Promise<LeanPGlite> {
    const client = new LeanPGlite(options)
    await client.waitReady
    client.installTextParsers()
    return client
  }
}
