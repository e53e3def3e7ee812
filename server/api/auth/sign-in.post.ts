import { eq } from 'drizzle-orm'
import { users } from '~~/server/db/schema'
import { SignInSchema } from '#shared/schemas/users'

// One answer for an unknown address and a wrong password, so neither can be told apart.
const GENERIC_REFUSAL = 'That e-mail address and password do not match an account.'

export default defineEventHandler(async (event) => {
  const { email, password } = await readValidBody(event, SignInSchema)
  const db = await useDb()
  const [row] = await db.select({ id: users.id, hash: users.passwordHash, disabled: users.disabled })
    .from(users).where(eq(users.email, email))
  // Verify against a stand-in hash when the address is unknown, so timing does not tell either.
  const valid = await verifyPassword(row?.hash ?? await standInHash(), password)
  if (!row || !valid) throw createError({ statusCode: 401, message: GENERIC_REFUSAL })
  if (row.disabled) throw createError({ statusCode: 403, message: 'This account is disabled. Ask an administrator to enable it.' })

  const user = await loadSessionUser(row.id)
  if (!user) throw createError({ statusCode: 401, message: GENERIC_REFUSAL })
  await setUserSession(event, { user, loggedInAt: new Date().toISOString() })
  await writeAudit(db, user, 'session.signed-in', { type: 'user', id: user.id })
  return { user }
})

let standIn: Promise<string> | undefined
const standInHash = () => (standIn ??= hashPassword('not-a-real-password-for-timing'))
