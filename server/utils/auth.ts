import type { H3Event } from 'h3'
import { eq, sql } from 'drizzle-orm'
import { organisations, users } from '~~/server/db/schema'
import type { Role } from '#shared/types/roles'
import type { SessionUser } from '#shared/types/user'
import { preparedQuery } from './prepared-query'
import { sharedReads } from './shared-reads'

export type CurrentUser = SessionUser

/**
 * Who is asking, re-read from the database on every call: a user disabled or given another
 * role a moment ago is treated as they are now, not as their session cookie remembers.
 */
export async function requireUser(event: H3Event): Promise<CurrentUser> {
  const session = await getUserSession(event)
  const id = session.user?.id
  if (!id) throw createError({ statusCode: 401, message: 'Sign in to continue.' })
  const user = await loadSessionUser(id)
  if (!user) {
    await clearUserSession(event)
    throw createError({ statusCode: 401, message: 'Your account is no longer active. Ask an administrator if this is unexpected.' })
  }
  event.context.user = user
  return user
}

/** The signed-in user, or null for anyone else (public routes that show more to members). */
export async function optionalUser(event: H3Event): Promise<CurrentUser | null> {
  const session = await getUserSession(event)
  const id = session.user?.id
  return id ? (await loadSessionUser(id)) ?? null : null
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
  if (user.role !== 'admin' && user.role !== 'operator') throw createError({ statusCode: 403, message: 'This needs the admin role.' })
  return user
}
/** The instance's operator: organisations, the demo mailbox, instance-wide work. */
export const requireOperator = (event: H3Event) => requireRole(event, 'operator')

/**
 * Which organisation's people this administrator may act on: the operator every one (null), an
 * admin only their own.
 */
export const administeredOrganisation = (admin: CurrentUser): string | null => admin.role === 'operator' ? null : admin.organisationId

/** Only the operator may make someone an operator: an admin who could would hold every organisation. */
export function assertMayGrant(admin: CurrentUser, role: Role | undefined) {
  if (role === 'operator' && admin.role !== 'operator') {
    throw createError({ statusCode: 403, message: 'role: Making someone an operator needs the operator role.', data: { issues: [{ field: 'role', message: 'Choose a role other than operator.' }] } })
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
  organisationId: users.organisationId,
  organisationName: organisations.name,
  organisationIllustrative: organisations.illustrative,
}).from(users)
  .innerJoin(organisations, eq(organisations.id, users.organisationId))
  .where(eq(users.id, sql.placeholder('id')))
  .prepare('session_user'))

/** The signed-in user's row as routes see it; undefined when missing or disabled (concurrent calls share a query). */
export const loadSessionUser = sharedReads(async (id: string): Promise<CurrentUser | undefined> => {
  const [row] = await (await sessionUserQuery()).execute({ id })
  if (!row || row.disabled) return undefined
  const { disabled: _disabled, ...user } = row
  return { ...user, locale: user.locale === 'es' ? 'es' : 'en' }
})
