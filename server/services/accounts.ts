import { randomBytes } from 'node:crypto'
import { and, eq, gt, isNull } from 'drizzle-orm'
import { accountTokens, organisations, users } from '~~/server/db/schema'
import type { z } from 'zod'
import type { InvitationSchema } from '#shared/schemas/accounts'
import { passwordAddressProblem } from '#shared/schemas/users'
import { assertMayGrant, endSessions, type CurrentUser } from '../utils/auth'
import { organisationForPeople } from './users'
import { invitationMail, passwordResetMail } from '../mail/templates'
import { hashToken } from './watches'

// Accounts by e-mail: invitations from an admin, and password resets. Tokens travel only in the
// e-mail; the database keeps their hash. Each works once and expires.

const INVITATION_DAYS = 7
const RESET_HOURS = 1
const newToken = () => randomBytes(24).toString('base64url')

export async function inviteUser(admin: CurrentUser, input: z.infer<typeof InvitationSchema>) {
  assertMayGrant(admin, input.role)
  const organisation = await organisationForPeople(admin, input.organisationId)
  const db = await useDb()
  const [existing] = await db.select({ id: users.id }).from(users).where(eq(users.email, input.email))
  if (existing) throw createError({ statusCode: 409, message: `email: ${input.email} already has an account.` })
  const token = newToken()
  await db.transaction(async (tx) => {
    const [row] = await tx
      .insert(accountTokens)
      .values({
        kind: 'invitation',
        tokenHash: hashToken(token),
        email: input.email,
        name: input.name,
        role: input.role,
        organisationId: input.organisationId,
        invitedBy: admin.id,
        expiresAt: new Date(Date.now() + INVITATION_DAYS * 86_400_000),
      })
      .returning({ id: accountTokens.id })
    const mail = invitationMail(
      input.language,
      admin.name,
      organisation.name,
      input.role,
      `${appUrl()}/account/invitation?token=${token}`,
    )
    await queueMail(tx, { to: input.email, ...mail, dedupeKey: `invitation:${row!.id}` })
    await writeAudit(
      tx,
      admin,
      'user.invited',
      { type: 'invitation', id: row!.id },
      { email: input.email, role: input.role },
      organisation.id,
    )
  })
}

/** A usable token of a kind, or 404 (unknown or used) / 410 (expired) saying what to do. */
async function usableToken(kind: string, token: string) {
  const db = await useDb()
  const [row] = await db
    .select()
    .from(accountTokens)
    .where(and(eq(accountTokens.kind, kind), eq(accountTokens.tokenHash, hashToken(token))))
  const what = kind === 'invitation' ? 'invitation' : 'reset link'
  if (!row || row.usedAt)
    throw createError({
      statusCode: 404,
      message: `This ${what} has already been used or is not valid.${kind === 'invitation' ? ' Ask your administrator for a new invitation.' : ' Ask for a new one on the sign-in page.'}`,
    })
  if (row.expiresAt <= new Date())
    throw createError({
      statusCode: 410,
      message: `This ${what} has expired.${kind === 'invitation' ? ' Ask your administrator for a new invitation.' : ' Ask for a new one on the sign-in page.'}`,
    })
  return row
}

/** The address is known only from the token, so this password rule is checked here, not in the schema. */
function checkPasswordForAddress(password: string, email: string) {
  const problem = passwordAddressProblem(password, email)
  if (problem)
    throw createError({
      statusCode: 400,
      message: `password: ${problem}`,
      data: { issues: [{ field: 'password', message: problem }] },
    })
}

export async function describeInvitation(token: string) {
  const row = await usableToken('invitation', token)
  const db = await useDb()
  const [organisation] = await db
    .select({ name: organisations.name })
    .from(organisations)
    .where(eq(organisations.id, row.organisationId!))
  return {
    email: row.email,
    name: row.name,
    role: row.role,
    organisation: organisation!.name,
    expiresAt: row.expiresAt,
  }
}

export async function acceptInvitation(token: string, password: string) {
  const row = await usableToken('invitation', token)
  checkPasswordForAddress(password, row.email)
  const passwordHash = await hashPassword(password)
  const db = await useDb()
  return db.transaction(async (tx) => {
    // Claim the token in the same statement that checks it, so a double click cannot create two users.
    const [claimed] = await tx
      .update(accountTokens)
      .set({ usedAt: new Date() })
      .where(and(eq(accountTokens.id, row.id), isNull(accountTokens.usedAt), gt(accountTokens.expiresAt, new Date())))
      .returning()
    if (!claimed) throw createError({ statusCode: 404, message: 'This invitation has already been used.' })
    const [taken] = await tx.select({ id: users.id }).from(users).where(eq(users.email, row.email))
    if (taken) throw createError({ statusCode: 409, message: `${row.email} already has an account; sign in instead.` })
    const [user] = await tx
      .insert(users)
      .values({ email: row.email, name: row.name!, role: row.role!, organisationId: row.organisationId!, passwordHash })
      .returning({ id: users.id })
    await writeAudit(tx, null, 'user.joined', { type: 'user', id: user!.id }, { invitation: row.id })
    return user!.id
  })
}

/**
 * Always the same answer, after the same work, whether or not the address has an account: the
 * request only queues a job (one insert either way), and the job looks the address up and mails.
 */
export async function requestPasswordReset(email: string, language: 'en' | 'es') {
  const db = await useDb()
  await enqueueJob(db, 'password-reset', { email, language })
  kickJobs()
}

/** The job behind a reset request: a link for an enabled account, nothing for any other address. */
export async function sendPasswordReset(email: string, language: 'en' | 'es') {
  const db = await useDb()
  const [user] = await db.select({ id: users.id, disabled: users.disabled }).from(users).where(eq(users.email, email))
  if (!user || user.disabled) return
  const token = newToken()
  await db.transaction(async (tx) => {
    // Only the newest link works: one left in an old e-mail or someone else's hands no longer does.
    await voidResetLinks(tx, user.id)
    const [row] = await tx
      .insert(accountTokens)
      .values({
        kind: 'password-reset',
        tokenHash: hashToken(token),
        email,
        userId: user.id,
        expiresAt: new Date(Date.now() + RESET_HOURS * 3_600_000),
      })
      .returning({ id: accountTokens.id })
    await queueMail(tx, {
      to: email,
      ...passwordResetMail(language, `${appUrl()}/account/reset?token=${token}`),
      dedupeKey: `reset:${row!.id}`,
    })
  })
}

export async function completePasswordReset(token: string, password: string) {
  const row = await usableToken('password-reset', token)
  checkPasswordForAddress(password, row.email)
  const passwordHash = await hashPassword(password)
  const db = await useDb()
  await db.transaction(async (tx) => {
    const [claimed] = await tx.update(accountTokens).set({ usedAt: new Date() })
      .where(and(eq(accountTokens.id, row.id), isNull(accountTokens.usedAt))).returning()
    if (!claimed) throw createError({ statusCode: 404, message: 'This reset link has already been used.' })
    await tx.update(users).set({ passwordHash, updatedAt: new Date() }).where(eq(users.id, row.userId!))
    // A new password ends every session (a stolen cookie included) and every other link.
    await endSessions(tx, row.userId!)
    await voidResetLinks(tx, row.userId!)
    await writeAudit(tx, null, 'user.password-reset', { type: 'user', id: row.userId })
  })
}

type Tx = Parameters<Parameters<Awaited<ReturnType<typeof useDb>>['transaction']>[0]>[0]

/** Mark every unused reset link of this user as used. */
function voidResetLinks(tx: Tx, userId: string) {
  return tx
    .update(accountTokens)
    .set({ usedAt: new Date() })
    .where(
      and(eq(accountTokens.kind, 'password-reset'), eq(accountTokens.userId, userId), isNull(accountTokens.usedAt)),
    )
}
