import { and, asc, eq, ne } from 'drizzle-orm'
import { organisations, users } from '~~/server/db/schema'
import type { CreateUserInput, UpdateUserInput } from '#shared/schemas/users'
import { administeredOrganisation, assertMayGrant, endSessions, type CurrentUser } from '../utils/auth'

// People are administered by their organisation's admins, and by the operator for every organisation.
// An organisation an admin does not administer reads as missing, exactly like one that does not exist.

const MISSING_ORGANISATION = 'organisationId: No such organisation. Choose one from the list.'

/** The organisation a user may be created or invited into by this administrator, or a 400. */
export async function organisationForPeople(admin: CurrentUser, organisationId: string) {
  const scope = administeredOrganisation(admin)
  const db = await useDb()
  const [organisation] = scope && scope !== organisationId
    ? []
    : await db.select().from(organisations).where(eq(organisations.id, organisationId))
  if (!organisation)
    throw createError({
      statusCode: 400,
      message: MISSING_ORGANISATION,
      data: { issues: [{ field: 'organisationId', message: 'Choose an organisation from the list.' }] },
    })
  return organisation
}

/** The organisations this administrator may create or invite people into (their own; every one for the operator). */
export async function organisationsForPeople(admin: CurrentUser) {
  const scope = administeredOrganisation(admin)
  const db = await useDb()
  return db
    .select()
    .from(organisations)
    .where(scope ? eq(organisations.id, scope) : undefined)
    .orderBy(asc(organisations.name))
}

export async function listUsers(admin: CurrentUser) {
  const scope = administeredOrganisation(admin)
  const db = await useDb()
  return db.select({
    id: users.id, email: users.email, name: users.name, role: users.role, disabled: users.disabled,
    organisationId: users.organisationId, organisationName: organisations.name, createdAt: users.createdAt,
  }).from(users)
    .innerJoin(organisations, eq(organisations.id, users.organisationId))
    .where(scope ? eq(users.organisationId, scope) : undefined)
    .orderBy(asc(organisations.name), asc(users.name))
}

export async function createUser(admin: CurrentUser, input: CreateUserInput) {
  assertMayGrant(admin, input.role)
  await organisationForPeople(admin, input.organisationId)
  const db = await useDb()
  const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email))
  if (existing) throw createError({ statusCode: 409, message: `email: ${input.email} already has an account.` })

  const passwordHash = await hashPassword(input.password)
  return db.transaction(async (tx) => {
    const [created] = await tx
      .insert(users)
      .values({
        email: input.email,
        name: input.name,
        role: input.role,
        organisationId: input.organisationId,
        passwordHash,
      })
      .returning({
        id: users.id,
        email: users.email,
        name: users.name,
        role: users.role,
        organisationId: users.organisationId,
        disabled: users.disabled,
      })
    await writeAudit(
      tx,
      admin,
      'user.created',
      { type: 'user', id: created!.id },
      { email: input.email, role: input.role },
      input.organisationId,
    )
    return created!
  })
}

export async function updateUser(admin: CurrentUser, id: string, patch: UpdateUserInput) {
  const scope = administeredOrganisation(admin)
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [target] = await tx.select().from(users).where(eq(users.id, id)).for('update')
    if (!target || (scope && target.organisationId !== scope))
      throw createError({ statusCode: 404, message: 'No such user.' })
    // An admin may neither make nor unmake the operator: either would reach beyond their organisation.
    assertMayGrant(admin, patch.role)
    if (target.role === 'operator') assertMayGrant(admin, 'operator')
    await keepOneInCharge(tx, target, patch)

    const [updated] = await tx
      .update(users)
      .set({ ...patch, updatedAt: new Date() })
      .where(eq(users.id, id))
      .returning({
        id: users.id,
        email: users.email,
        name: users.name,
        role: users.role,
        organisationId: users.organisationId,
        disabled: users.disabled,
      })
    // Disabling ends the user's sessions for good: enabling them again later does not revive old cookies.
    if (patch.disabled === true && !target.disabled) await endSessions(tx, id)
    await writeAudit(
      tx,
      admin,
      'user.updated',
      { type: 'user', id },
      { before: { role: target.role, disabled: target.disabled, name: target.name }, after: patch },
      target.organisationId,
    )
    return updated!
  })
}

type Tx = Parameters<Parameters<Awaited<ReturnType<typeof useDb>>['transaction']>[0]>[0]

/** The last active operator of the instance, and the last active admin of an organisation, stay so. */
async function keepOneInCharge(tx: Tx, target: typeof users.$inferSelect, patch: UpdateUserInput) {
  if ((target.role !== 'admin' && target.role !== 'operator') || target.disabled) return
  const loses = (patch.role !== undefined && patch.role !== target.role) || patch.disabled === true
  if (!loses) return
  const sameScope = target.role === 'admin' ? eq(users.organisationId, target.organisationId) : undefined
  const others = await tx.select({ id: users.id }).from(users)
    .where(and(eq(users.role, target.role), eq(users.disabled, false), ne(users.id, target.id), sameScope))
  if (others.length > 0) return
  throw createError({
    statusCode: 409,
    message: target.role === 'admin'
      ? 'This is the last active administrator of this organisation. Make another of its users an administrator first.'
      : 'This is the last active operator. Make another user an operator first.',
  })
}

/** A user's own preferences (language), remembered across devices. */
export async function setOwnLocale(user: CurrentUser, locale: string) {
  const db = await useDb()
  await db.update(users).set({ locale, updatedAt: new Date() }).where(eq(users.id, user.id))
}
