import { eq } from 'drizzle-orm'
import { users } from '~~/server/db/schema'
import { SignInSchema } from '#shared/schemas/users'

// One answer for an unknown address and a wrong password, so neither can be told apart.
const GENERIC_REFUSAL = 'That e-mail address and password do not match an account.'

// Password guessing is limited twice: per address (someone trying many passwords on one account)
// and per client (someone trying one password on many accounts). Only failures count, so people
// signing in correctly from one office never lock each other out, and a lock on one address does
// not touch any other address.
const WINDOW_MS = 15 * 60_000
const ADDRESS_FAILURES = 10
const CLIENT_FAILURES = 50
const addressKey = (email: string) => `sign-in:address:${email}`
const clientFailureKey = (client: string) => `sign-in:client:${client}`

export default defineEventHandler(async (event) => {
  const client = clientKey(event)
  await refuseIfLocked(event, clientFailureKey(client), CLIENT_FAILURES, 'Too many failed sign-ins from this connection.')
  const { email, password } = await readValidBody(event, SignInSchema)
  await refuseIfLocked(event, addressKey(email), ADDRESS_FAILURES, 'Too many failed sign-ins for this address, so it is locked for now.')

  const db = await useDb()
  const [row] = await db.select({ id: users.id, hash: users.passwordHash, disabled: users.disabled, organisationId: users.organisationId })
    .from(users).where(eq(users.email, email))
  // Verify against a stand-in hash when the address is unknown, so timing does not tell either.
  const valid = await verifyPassword(row?.hash ?? await standInHash(), password)
  if (!row || !valid) {
    const forAddress = await countFailure(addressKey(email), WINDOW_MS)
    const forClient = await countFailure(clientFailureKey(client), WINDOW_MS)
    await recordFailure(db, { email, userId: row?.id ?? null, organisationId: row?.organisationId ?? null, client, forAddress, forClient })
    throw createError({ statusCode: 401, message: GENERIC_REFUSAL })
  }
  if (row.disabled) throw createError({ statusCode: 403, message: 'This account is disabled. Ask an administrator to enable it.' })

  await clearFailures(addressKey(email))
  const user = await startSession(event, row.id)
  if (!user) throw createError({ statusCode: 401, message: GENERIC_REFUSAL })
  await writeAudit(db, user, 'session.signed-in', { type: 'user', id: user.id })
  return { user }
})

interface Failure { email: string, userId: string | null, organisationId: string | null, client: string, forAddress: number, forClient: number }

/** A failed sign-in leaves an audit line; the failure that locks an address or client says so. */
async function recordFailure(db: Awaited<ReturnType<typeof useDb>>, failure: Failure) {
  const { email, userId, organisationId, client, forAddress, forClient } = failure
  const target = { type: 'user', id: userId }
  await writeAudit(db, null, 'session.sign-in-failed', target, { email, client, failuresForAddress: forAddress }, organisationId)
  if (forAddress === ADDRESS_FAILURES) await writeAudit(db, null, 'session.locked-out', target, { email, client, scope: 'address', minutes: WINDOW_MS / 60_000 }, organisationId)
  if (forClient === CLIENT_FAILURES) await writeAudit(db, null, 'session.locked-out', { type: 'client' }, { email, client, scope: 'client', minutes: WINDOW_MS / 60_000 }, organisationId)
}

let standIn: Promise<string> | undefined
const standInHash = () => (standIn ??= hashPassword('not-a-real-password-for-timing'))
