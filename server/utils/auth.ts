import type { H3Event } from 'h3'
import { and, eq, sql } from 'drizzle-orm'
import { organisations, users } from '~~/server/db/schema'
import type { Database } from '~~/server/db/client'
import type { Role } from '#shared/types/roles'
import type { SessionUser } from '#shared/types/user'
import { preparedQuery } from './prepared-query'
import { recentReads } from './recent-reads'
import { sharedReads } from './shared-reads'
import { languageOf } from '#shared/wording/translate'

export type CurrentUser = SessionUser

/**
 * Who is asking, as the database has them now, not as their session cookie remembers: a user disabled
 * or given another role a moment ago is treated as they are now. A request that may write reads the
 * row afresh; a GET may take one read in the last RECENT_READ_MS, which any write through this
 * instance drops at once (server/middleware/02.writes-forget-reads.ts), so only a change made through
 * another instance can take that long to reach a GET here.
 */
export async function requireUser(event: H3Event): Promise<CurrentUser> {
  const session = await sessionClaim(event)
  const id = session.userId
  if (!id) throw createError({ statusCode: 401, message: 'Sign in to continue.' })
  const row = await sessionRowFor(event, id)
  if (!row) {
    await clearUserSession(event)
    throw createError({
      statusCode: 401,
      message: 'Your account is no longer active. Ask an administrator if this is unexpected.',
    })
  }
  if (row.generation !== session.generation) {
    await clearUserSession(event)
    throw createError({
      statusCode: 401,
      message: 'This session has ended (signed out, or the password was changed). Sign in again.',
    })
  }
  event.context.user = row.user
  return row.user
}

/** The signed-in user, or null for anyone else (public routes that show more to members). */
export async function optionalUser(event: H3Event): Promise<CurrentUser | null> {
  const session = await sessionClaim(event)
  const id = session.userId
  const row = id ? await sessionRowFor(event, id) : undefined
  return row && row.generation === session.generation ? row.user : null
}

/** Start a session for this user under their current generation (sign-in, accepted invitation). */
export async function startSession(event: H3Event, id: string): Promise<CurrentUser | undefined> {
  const row = await loadSessionRow(id)
  if (!row) return undefined
  await replaceUserSession(event, { user: row.user, generation: row.generation, loggedInAt: new Date().toISOString() })
  return row.user
}

/** Refresh the session's snapshot of the user, keeping the session itself (its generation and start). */
export async function refreshSessionSnapshot(event: H3Event, user: CurrentUser) {
  const { id: _id, ...session } = await getUserSession(event)
  await replaceUserSession(event, { ...session, user })
}

/**
 * End every session of a user, on every device: their cookies carry the old generation. Pass the
 * generation a session was signed in under to end sessions only if that one is still live, so a
 * cookie that has already ended cannot sign its owner out of a newer session.
 */
export async function endSessions(db: Pick<Database, 'update'>, userId: string, ifGeneration?: number) {
  const which
    = ifGeneration === undefined
      ? eq(users.id, userId)
      : and(eq(users.id, userId), eq(users.sessionGeneration, ifGeneration))
  await db.update(users).set({ sessionGeneration: sql`${users.sessionGeneration} + 1` }).where(which)
}

/** Signed in and holding one of the given roles; otherwise 403 naming what is needed. */
export async function requireRole(event: H3Event, ...roles: Role[]): Promise<CurrentUser> {
  const user = await requireUser(event)
  if (!roles.includes(user.role)) {
    throw createError({ statusCode: 403, message: `This needs the ${roles.join(' or ')} role.` })
  }
  return user
}

/** An organisation's administrator, or the operator (who administers every organisation). */
export async function requireAdmin(event: H3Event): Promise<CurrentUser> {
  const user = await requireUser(event)
  if (user.role !== 'admin' && user.role !== 'operator')
    throw createError({ statusCode: 403, message: 'This needs the admin role.' })
  return user
}
/** The instance's operator: organisations, the demo mailbox, instance-wide work. */
export const requireOperator = (event: H3Event) => requireRole(event, 'operator')

/**
 * Which organisation's people this administrator may act on: the operator every one (null), an
 * admin only their own.
 */
export const administeredOrganisation = (admin: CurrentUser): string | null =>
  admin.role === 'operator' ? null : admin.organisationId

/** Only the operator may make someone an operator: an admin who could would hold every organisation. */
export function assertMayGrant(admin: CurrentUser, role: Role | undefined) {
  if (role === 'operator' && admin.role !== 'operator') {
    throw createError({
      statusCode: 403,
      message: 'role: Making someone an operator needs the operator role.',
      data: { issues: [{ field: 'role', message: 'Choose a role other than operator.' }] },
    })
  }
}

/**
 * Organisation scoping: a record of another organisation answers 404, exactly like a missing
 * one, so ids of other organisations' records do not leak.
 */
export function assertSameOrganisation(user: CurrentUser, organisationId: string | null | undefined, what = 'record') {
  if (!organisationId || organisationId !== user.organisationId) {
    throw createError({ statusCode: 404, message: `No such ${what}.` })
  }
}

const sessionUserQuery = preparedQuery(db => db.select({
  id: users.id,
  email: users.email,
  name: users.name,
  role: users.role,
  locale: users.locale,
  disabled: users.disabled,
  generation: users.sessionGeneration,
  organisationId: users.organisationId,
  organisationName: organisations.name,
  organisationIllustrative: organisations.illustrative,
}).from(users)
  .innerJoin(organisations, eq(organisations.id, users.organisationId))
  .where(eq(users.id, sql.placeholder('id')))
  .prepare('session_user'))

/** Whom a request's session cookie names, and the session generation it was signed in under. */
interface SessionClaim { userId?: string, generation?: number }

async function unsealedClaim(event: H3Event): Promise<SessionClaim> {
  const session = await getUserSession(event)
  return { userId: session.user?.id, generation: session.generation }
}

/**
 * A GET request's session cookie, unsealed once every RECENT_READ_MS per cookie: unsealing (two key
 * derivations, a MAC check and a decryption) cost a crowd's 304s more than the rest of the answer
 * (`npm run load`). Kept by the whole sealed value, which only this server can make, so the claim is
 * the one unsealing would give; a cookie may outlive its 12 hours by that moment at most, and a session
 * ended meanwhile is still refused by its generation.
 */
const recentClaim = recentReads((_sealed: string, event: H3Event) => unsealedClaim(event))

const readOnly = (event: H3Event) => event.method === 'GET' || event.method === 'HEAD'

function sessionClaim(event: H3Event): Promise<SessionClaim> {
  const sealed = readOnly(event) ? getCookie(event, useRuntimeConfig(event).session.name!) : undefined
  return sealed ? recentClaim(sealed, event) : unsealedClaim(event)
}

/** The signed-in user's row and session generation; undefined when missing or disabled. */
async function readSessionRow(id: string): Promise<{ user: CurrentUser, generation: number } | undefined> {
  const [row] = await (await sessionUserQuery()).execute({ id })
  if (!row || row.disabled) return undefined
  const { disabled: _disabled, generation, ...user } = row
  return { user: { ...user, locale: languageOf(user.locale) }, generation }
}
/** For requests that may write: fresh, though concurrent calls share a query. */
const loadSessionRow = sharedReads(readSessionRow)
/** For GET requests: one read every RECENT_READ_MS for a crowd of readers. */
const recentSessionRow = recentReads(readSessionRow)
const sessionRowFor = (event: H3Event, id: string) => (readOnly(event) ? recentSessionRow(id) : loadSessionRow(id))

/** The user's row as routes see it; undefined when missing or disabled. */
export const loadSessionUser = async (id: string) => (await loadSessionRow(id))?.user
