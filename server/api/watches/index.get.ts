import { and, eq, ne } from 'drizzle-orm'
import { sites, watches } from '~~/server/db/schema'

// The signed-in user's own watches (by their e-mail address).
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const db = await useDb()
  return db.select({ id: watches.id, siteId: watches.siteId, siteName: sites.name, state: watches.state, language: watches.language, createdAt: watches.createdAt, confirmedAt: watches.confirmedAt })
    .from(watches).innerJoin(sites, eq(sites.id, watches.siteId))
    .where(and(eq(watches.email, user.email), ne(watches.state, 'unsubscribed')))
})
