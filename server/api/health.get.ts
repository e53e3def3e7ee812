import { sql } from 'drizzle-orm'

// Public liveness and readiness: answers once the database is open and migrated.
export default defineEventHandler(async (event) => {
  try {
    const handle = await useDbHandle()
    await handle.db.execute(sql`select 1`)
    return { status: 'ok', database: handle.describe }
  }
  catch {
    setResponseStatus(event, 503)
    return { status: 'unavailable', database: 'not reachable' }
  }
})
