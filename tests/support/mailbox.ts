import { expect } from 'vitest'
import type { Page } from 'playwright-core'

export interface MailboxMessage {
  id: string
  to: string[]
  subject: string
  text: string
  html: string
  headers: Record<string, string>
}

/**
 * Waits until the stand-in mailbox holds a message to `address` whose subject matches, reading it
 * through the signed-in operator's page (the outbox worker sends in the background, so it is polled).
 */
export async function awaitMail(admin: Page, address: string, subject: RegExp): Promise<MailboxMessage> {
  let found: MailboxMessage | undefined
  await expect.poll(async () => {
    const messages: MailboxMessage[] = await (await admin.request.get('/api/admin/mailbox')).json()
    found = messages.find(message => message.to.includes(address) && subject.test(message.subject))
    return Boolean(found)
  }, { timeout: 20_000, message: `mail to ${address} matching ${subject}` }).toBe(true)
  return found!
}

/** The same-origin path (and query) of the first link in a mail's text that starts with `path`. */
export function linkIn(text: string, path: string): string {
  const match = text.match(new RegExp(`https?://[^\\s/]+(${path.replace(/[?]/g, '\\?')}[^\\s]*)`))
  if (!match) throw new Error(`No ${path} link in:\n${text}`)
  return match[1]!
}
