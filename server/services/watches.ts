import { createHash, randomBytes } from 'node:crypto'
import { and, eq, ne } from 'drizzle-orm'
import { briefings, sites, watches } from '~~/server/db/schema'
import type { z } from 'zod'
import type { WatchRequestSchema } from '#shared/schemas/watches'
import type { CurrentUser } from '../utils/auth'
import { shareWatchEndedMail, watchConfirmMail } from '../mail/templates'
import type { Database } from '../db/client'
import { languageOf } from '#shared/wording/translate'

/** How long a confirmation link works (WATCH_CONFIRM_HOURS overrides, e.g. 0 in tests of expiry). */
const confirmHours = () => serverConfig().WATCH_CONFIRM_HOURS
export const hashToken = (token: string) => createHash('sha256').update(token).digest('hex')
const newToken = () => randomBytes(24).toString('base64url')

export const unsubscribeUrl = (token: string) => `${appUrl()}/watches/unsubscribe?token=${token}`
export const unsubscribeHeaders = (token: string) => ({
  'List-Unsubscribe': `<${appUrl()}/api/watches/unsubscribe?token=${token}>`,
  'List-Unsubscribe-Post': 'List-Unsubscribe=One-Click',
})

/** The site to watch, and the briefing whose link it came through (the watch sees only what it showed). */
async function siteFor(
  request: z.infer<typeof WatchRequestSchema>,
  user: CurrentUser | null,
): Promise<{ id: string, name: string, briefingId: string | null }> {
  const db = await useDb()
  if (request.shareToken) {
    const [row] = await db
      .select({ id: sites.id, name: sites.name, briefingId: briefings.id })
      .from(briefings)
      .innerJoin(sites, eq(sites.id, briefings.siteId))
      .where(and(eq(briefings.shareToken, request.shareToken), eq(briefings.state, 'issued')))
    if (!row) throw createError({ statusCode: 404, message: 'This briefing link does not open a briefing any more.' })
    return row
  }
  if (!user)
    throw createError({
      statusCode: 401,
      message: 'Sign in to watch a site by its id, or use the link of a shared briefing.',
    })
  const [row] = await db
    .select({ id: sites.id, name: sites.name })
    .from(sites)
    .where(and(eq(sites.id, request.siteId!), eq(sites.organisationId, user.organisationId)))
  if (!row) throw createError({ statusCode: 404, message: 'No such site.' })
  return { ...row, briefingId: null }
}

/** The signed-in user's own watches (by their e-mail address), stopped ones left out. */
export async function listOwnWatches(user: CurrentUser) {
  const db = await useDb()
  return db
    .select({
      id: watches.id,
      siteId: watches.siteId,
      siteName: sites.name,
      state: watches.state,
      language: watches.language,
      createdAt: watches.createdAt,
      confirmedAt: watches.confirmedAt,
    })
    .from(watches)
    .innerJoin(sites, eq(sites.id, watches.siteId))
    .where(and(eq(watches.email, user.email), ne(watches.state, 'unsubscribed')))
}

/** Stops one of the user's own watches; another's answers 404 like one that does not exist. */
export async function stopOwnWatch(user: CurrentUser, id: string) {
  const db = await useDb()
  const [stopped] = await db
    .update(watches)
    .set({ state: 'unsubscribed', unsubscribedAt: new Date(), confirmTokenHash: null })
    .where(and(eq(watches.id, id), eq(watches.email, user.email)))
    .returning({ id: watches.id })
  if (!stopped) throw createError({ statusCode: 404, message: 'No such watch.' })
}

/**
 * Starts (or restarts) a watch and sends the confirmation. The answer is the same whether or not
 * the address already watches the site, so it tells a stranger nothing.
 */
export async function requestWatch(request: z.infer<typeof WatchRequestSchema>, user: CurrentUser | null) {
  const site = await siteFor(request, user)
  const token = newToken()
  const db = await useDb()
  await db.transaction(async (tx) => {
    const [existing] = await tx
      .select()
      .from(watches)
      .where(and(eq(watches.siteId, site.id), eq(watches.email, request.email)))
    if (existing?.state === 'active') return
    const values = {
      confirmTokenHash: hashToken(token),
      confirmExpiresAt: new Date(Date.now() + confirmHours() * 3_600_000),
      language: request.language,
      state: 'pending' as const,
      briefingId: site.briefingId,
      endedReason: null,
      undeliverableAt: null,
      userId: user?.email === request.email ? user.id : (existing?.userId ?? null),
    }
    const [watch] = existing
      ? await tx.update(watches).set(values).where(eq(watches.id, existing.id)).returning()
      : await tx
          .insert(watches)
          .values({ ...values, siteId: site.id, email: request.email, unsubscribeToken: newToken() })
          .returning()
    const mail = watchConfirmMail(
      request.language,
      site.name,
      `${appUrl()}/watches/confirm?token=${token}`,
      unsubscribeUrl(watch!.unsubscribeToken),
    )
    await queueMail(tx, {
      to: request.email,
      ...mail,
      headers: unsubscribeHeaders(watch!.unsubscribeToken),
      dedupeKey: `watch-confirm:${watch!.id}:${hashToken(token).slice(0, 16)}`,
    })
  })
}

/** The pending watch a confirmation link belongs to: 404 once used or unknown, 410 once expired. */
async function pendingWatch(token: string) {
  const db = await useDb()
  const [watch] = await db.select().from(watches).where(eq(watches.confirmTokenHash, hashToken(token)))
  if (!watch)
    throw createError({
      statusCode: 404,
      message:
        'This confirmation link has already been used or is not valid. If you are not receiving updates, ask again from the site or briefing page.',
    })
  if (watch.confirmExpiresAt && watch.confirmExpiresAt <= new Date()) {
    throw createError({
      statusCode: 410,
      message: 'This confirmation link has expired. Ask again from the site or briefing page.',
    })
  }
  return watch
}

async function siteName(siteId: string) {
  const db = await useDb()
  const [site] = await db.select({ name: sites.name }).from(sites).where(eq(sites.id, siteId))
  return site!.name
}

/**
 * What an e-mailed watch link is about, before the reader presses: the site, the address, and whether
 * the watch is already stopped. Both links answer this one shape, so their page reads either alike.
 */
export interface WatchLinkAbout { site: string, email: string, stopped: boolean }

/** What a confirmation link would start, without starting it (a pending watch is never stopped). */
export async function describeConfirmLink(token: string): Promise<WatchLinkAbout> {
  const watch = await pendingWatch(token)
  return { site: await siteName(watch.siteId), email: watch.email, stopped: false }
}

export async function confirmWatch(token: string) {
  const watch = await pendingWatch(token)
  const db = await useDb()
  await db
    .update(watches)
    .set({ state: 'active', confirmedAt: new Date(), confirmTokenHash: null, confirmExpiresAt: null })
    .where(eq(watches.id, watch.id))
  return { site: await siteName(watch.siteId), email: watch.email }
}

/** What an unsubscribe link would stop, and whether it already is stopped, without stopping it. */
export async function describeUnsubscribeLink(token: string): Promise<WatchLinkAbout> {
  const db = await useDb()
  const [watch] = await db.select().from(watches).where(eq(watches.unsubscribeToken, token))
  if (!watch) throw createError({ statusCode: 404, message: 'This unsubscribe link is not valid; copy the whole link from the e-mail.' })
  return { site: await siteName(watch.siteId), email: watch.email, stopped: watch.state === 'unsubscribed' }
}

export async function unsubscribe(token: string) {
  const db = await useDb()
  const [watch] = await db
    .update(watches)
    .set({ state: 'unsubscribed', unsubscribedAt: new Date(), confirmTokenHash: null })
    .where(eq(watches.unsubscribeToken, token))
    .returning()
  if (!watch)
    throw createError({
      statusCode: 404,
      message: 'This unsubscribe link is not valid; copy the whole link from the e-mail.',
    })
  return { site: await siteName(watch.siteId), email: watch.email }
}

type Tx = Parameters<Parameters<Database['transaction']>[0]>[0]

/**
 * Ends the watches started from a briefing's link when the link is withdrawn, in the transaction
 * that withdraws it; each active one is told once. Pending ones just stop: their confirmation link
 * no longer works.
 */
export async function endShareWatches(tx: Tx, briefing: { id: string, siteId: string, title: string }) {
  const end = (state: 'pending' | 'active') =>
    tx
      .update(watches)
      .set({
        state: 'unsubscribed',
        endedReason: 'share-revoked',
        unsubscribedAt: new Date(),
        confirmTokenHash: null,
        confirmExpiresAt: null,
      })
      .where(and(eq(watches.briefingId, briefing.id), eq(watches.state, state)))
      .returning()
  await end('pending')
  const active = await end('active')
  if (!active.length) return
  const [site] = await tx.select({ name: sites.name }).from(sites).where(eq(sites.id, briefing.siteId))
  for (const watch of active) {
    const language = languageOf(watch.language)
    await queueMail(tx, {
      to: watch.email,
      ...shareWatchEndedMail(language, site!.name, briefing.title),
      dedupeKey: `watch-ended:${watch.id}:${briefing.id}`,
    })
  }
}
