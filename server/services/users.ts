import { and, eq, ne } from 'drizzle-orm'
import { organisations, users } from '~~/server/db/schema'
import type { CreateUserInput, UpdateUserInput } from '#shared/schemas/users'
import type { CurrentUser } from '../utils/auth'

export async function createUser(admin: CurrentUser, input: CreateUserInput) {
  const db = await useDb()
  const [organisation] = await db.select({ id: organisations.id }).from(organisations).where(eq(organisations.id, input.organisationId))
  if (!organisation) throw createError({ statusCode: 400, message: 'organisationId: No such organisation. Choose one from the list.' })
  const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email))
  if (existing) throw createError({ statusCode: 409, message: `email: ${input.email} already has an account.` })

  const passwordHash = await hashPassword(input.password)
  return db.transaction(async (tx) => {
    const [created] = await tx.insert(users).values({
      email: input.email, name: input.name, role: input.role, organisationId: input.organisationId, passwordHash,
    }).returning({ id: users.id, email: users.email, name: users.name, role: users.role, organisationId: users.organisationId, disabled: users.disabled })
    await writeAudit(tx, admin, 'user.created', { type: 'user', id: created!.id }, { email: input.email, role: input.role })
    return created!
  })
}

export async function updateUser(admin: CurrentUser, id: string, patch: UpdateUserInput) {
  const db = await useDb()
  return db.transaction(async (tx) => {
    const [target] = await tx.select().from(users).where(eq(users.id, id)).for('update')
    if (!target) throw createError({ statusCode: 404, message: 'No such user.' })

    const losesAdmin = target.role === 'admin' && !target.disabled
      && ((patch.role !== undefined && patch.role !== 'admin') || patch.disabled === true)
    if (losesAdmin) {
      const others = await tx.select({ id: users.id }).from(users)
        .where(and(eq(users.role, 'admin'), eq(users.disabled, false), ne(users.id, id)))
      if (others.length === 0) {
        throw createError({ statusCode: 409, message: 'This is the last active administrator. Make another user an administrator first.' })
      }
    }

    const [updated] = await tx.update(users).set({ ...patch, updatedAt: new Date() }).where(eq(users.id, id))
      .returning({ id: users.id, email: users.email, name: users.name, role: users.role, organisationId: users.organisationId, disabled: users.disabled })
    await writeAudit(tx, admin, 'user.updated', { type: 'user', id }, { before: { role: target.role, disabled: target.disabled, name: target.name }, after: patch })
    return updated!
  })
}
