import { eq } from 'drizzle-orm'
import { users } from '~~/server/db/schema'
import type { CurrentUser } from '../utils/auth'

// The database side of signing in: the account an address names, and the audit lines it leaves.

/** What signing in needs of the account an address names, if any. */
export async function accountForSignIn(email: string) {
  const db = await useDb()
  const [row] = await db
    .select({ id: users.id, hash: users.passwordHash, disabled: users.disabled, organisationId: users.organisationId })
    .from(users)
    .where(eq(users.email, email))
  return row
}

export interface SignInFailure {
  email: string
  userId: string | null
  organisationId: string | null
  client: string
  failuresForAddress: number
  /** Set when this failure locked the address: for how long. */
  lockedForMinutes: number | null
  /** Set when this failure slowed the client: to one attempt every so many seconds. */
  slowedToSeconds: number | null
}

/** A failed sign-in leaves an audit line; the failure that locks an address or slows a client says so. */
export async function recordSignInFailure(failure: SignInFailure) {
  const { email, userId, organisationId, client, failuresForAddress, lockedForMinutes, slowedToSeconds } = failure
  const db = await useDb()
  const target = { type: 'user', id: userId }
  await writeAudit(db, null, 'session.sign-in-failed', target, { email, client, failuresForAddress }, organisationId)
  if (lockedForMinutes !== null)
    await writeAudit(
      db,
      null,
      'session.locked-out',
      target,
      { email, client, scope: 'address', minutes: lockedForMinutes },
      organisationId,
    )
  if (slowedToSeconds !== null)
    await writeAudit(
      db,
      null,
      'session.locked-out',
      { type: 'client' },
      { email, client, scope: 'client', slowedToSeconds },
      organisationId,
    )
}

export async function recordSignIn(user: CurrentUser) {
  await writeAudit(await useDb(), user, 'session.signed-in', { type: 'user', id: user.id })
}
