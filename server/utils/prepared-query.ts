import type { Database } from '../db/client'

/**
 * A query that requests make over and over (who is signed in, an outlook's site, the latest releases),
 * built once per database and prepared with placeholders, then run with each request's values.
 * drizzle otherwise builds the SQL text anew on every call, which under a crowd of readers was more
 * than a quarter of everything the server allocated (a sampled heap profile during `npm run load`).
 * On a PostgreSQL server each connection also parses and plans the statement once, by its name.
 */
export function preparedQuery<T>(build: (db: Database) => T): () => Promise<T> {
  const built = new WeakMap<Database, T>()
  return async () => {
    const db = await useDb()
    let query = built.get(db)
    if (!query) {
      query = build(db)
      built.set(db, query)
    }
    return query
  }
}
