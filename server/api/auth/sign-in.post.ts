import { SignInSchema } from '#shared/schemas/users'
import { accountForSignIn, recordSignIn, recordSignInFailure } from '~~/server/services/sign-in'

// One answer for an unknown address and a wrong password, so neither can be told apart.
const GENERIC_REFUSAL = 'That e-mail address and password do not match an account.'

// Password guessing is limited twice. The guessed account: ten attempts in 15 minutes, taken before
// the password is checked in one atomic statement, so concurrent guesses cannot slip past; a success
// gives its attempt back and clears the rest. The client: after fifty failures it is slowed to one
// attempt every few seconds instead of locked out, so a correct password from a shared office
// address still gets in within seconds while a guesser gains next to nothing.
const WINDOW_MS = 15 * 60_000
const ADDRESS_FAILURES = 10
const CLIENT_FAILURES = 50
/** Seconds between attempts from a slowed client (SIGN_IN_SLOW_SECONDS overrides). */
const slowSeconds = () => serverConfig().SIGN_IN_SLOW_SECONDS
const addressKey = (email: string) => `sign-in:address:${email}`
const clientFailureKey = (client: string) => `sign-in:client:${client}`
const clientSlowKey = (client: string) => `sign-in:slow:${client}`

export default defineEventHandler(async (event) => {
  const client = clientKey(event)
  const { email, password } = await readValidBody(event, SignInSchema)

  const forClient = await tryTakeAttempt(clientFailureKey(client), CLIENT_FAILURES, WINDOW_MS)
  if (forClient === null) {
    const seconds = slowSeconds()
    await rateLimit(
      clientSlowKey(client),
      1,
      seconds * 1000,
      `failed sign-ins from this connection, so it may try once every ${seconds} seconds for now`,
      event,
    )
  }
  let forAddress: number
  try {
    forAddress = await takeAttempt(
      event,
      addressKey(email),
      ADDRESS_FAILURES,
      WINDOW_MS,
      'Too many failed sign-ins for this address, so it is locked for now.',
    )
  }
  catch (error) {
    if (forClient !== null) await returnAttempt(clientFailureKey(client))
    throw error
  }

  const row = await accountForSignIn(email)
  // Verify against a stand-in hash when the address is unknown, so timing does not tell either.
  const valid = await verifyPassword(row?.hash ?? await standInHash(), password)
  if (!row || !valid) {
    await recordSignInFailure({
      email,
      userId: row?.id ?? null,
      organisationId: row?.organisationId ?? null,
      client,
      failuresForAddress: forAddress,
      lockedForMinutes: forAddress === ADDRESS_FAILURES ? WINDOW_MS / 60_000 : null,
      slowedToSeconds: forClient === CLIENT_FAILURES ? slowSeconds() : null,
    })
    throw createError({ statusCode: 401, message: GENERIC_REFUSAL })
  }
  // The right password is not a guess: neither limit keeps it.
  if (forClient !== null) await returnAttempt(clientFailureKey(client))
  if (row.disabled) {
    await returnAttempt(addressKey(email))
    throw createError({ statusCode: 403, message: 'This account is disabled. Ask an administrator to enable it.' })
  }

  await clearFailures(addressKey(email))
  const user = await startSession(event, row.id)
  if (!user) throw createError({ statusCode: 401, message: GENERIC_REFUSAL })
  await recordSignIn(user)
  return { user }
})

let standIn: Promise<string> | undefined
const standInHash = () => (standIn ??= hashPassword('not-a-real-password-for-timing'))
