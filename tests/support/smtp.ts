import { once } from 'node:events'
import { simpleParser, type ParsedMail } from 'mailparser'
import { SMTPServer } from 'smtp-server'

/**
 * A real SMTP server on a loopback port that keeps what it receives, for tests that assert on
 * the mail the app sends. `next()` waits for a matching message; no sleeping.
 */
export class TestSmtp {
  readonly messages: ParsedMail[] = []
  private server: SMTPServer | null = null
  private waiters: { match: (m: ParsedMail) => boolean, resolve: (m: ParsedMail) => void }[] = []
  /** Addresses answered with a permanent 550 at RCPT TO, and how often each was tried. */
  private refused = new Map<string, number>()
  port = 0

  /** From now on, answer RCPT TO for this address with "550 no such mailbox" (a permanent refusal). */
  refuse(address: string) {
    this.refused.set(address, 0)
    return this
  }

  /** How many times the app tried a refused address. */
  triesOf(address: string) {
    return this.refused.get(address) ?? 0
  }

  async start(port = 0) {
    this.server = new SMTPServer({
      authOptional: true,
      disabledCommands: ['STARTTLS', 'AUTH'],
      logger: false,
      onRcptTo: (address, _session, callback) => {
        const tries = this.refused.get(address.address)
        if (tries === undefined) return callback()
        this.refused.set(address.address, tries + 1)
        callback(Object.assign(new Error('5.1.1 No such mailbox here'), { responseCode: 550 }))
      },
      onData: (stream, _session, callback) => {
        simpleParser(stream).then((mail) => {
          this.messages.push(mail)
          for (const waiter of this.waiters.filter(w => w.match(mail))) {
            this.waiters.splice(this.waiters.indexOf(waiter), 1)
            waiter.resolve(mail)
          }
          callback()
        }, error => callback(error))
      },
    })
    this.server.listen(port, '127.0.0.1')
    await once(this.server.server, 'listening')
    this.port = (this.server.server.address() as { port: number }).port
    return this
  }

  get url() {
    return `smtp://127.0.0.1:${this.port}`
  }

  /** The first message (already received or still to come) that matches. */
  next(match: (mail: ParsedMail) => boolean): Promise<ParsedMail> {
    const seen = this.messages.find(match)
    if (seen) return Promise.resolve(seen)
    return new Promise(resolve => this.waiters.push({ match, resolve }))
  }

  to(address: string) {
    return this.messages.filter(mail => addressesOf(mail).includes(address))
  }

  async stop() {
    const server = this.server
    this.server = null
    if (server) await new Promise<void>(resolve => server.close(() => resolve()))
  }
}

export function addressesOf(mail: ParsedMail): string[] {
  const to = Array.isArray(mail.to) ? mail.to : mail.to ? [mail.to] : []
  return to.flatMap(group => group.value.map(v => v.address ?? ''))
}

export const isTo = (address: string) => (mail: ParsedMail) => addressesOf(mail).includes(address)

/** The first link in a message's text that starts with the given prefix. */
export function linkIn(mail: ParsedMail, prefix: string): string {
  const match = (mail.text ?? '').match(new RegExp(`${prefix.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}\\S+`))
  if (!match) throw new Error(`No link starting ${prefix} in:\n${mail.text}`)
  return match[0]
}

/** A header exactly as sent (mailparser turns some, like List-Unsubscribe, into objects). */
export function rawHeader(mail: ParsedMail, name: string): string | undefined {
  const line = mail.headerLines.find(h => h.key === name.toLowerCase())?.line
  return line?.slice(line.indexOf(':') + 1).trim()
}
