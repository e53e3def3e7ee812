import { SMTPServer } from 'smtp-server'
import type { Database } from '../db/client'
import { mailbox } from '../db/schema'

/**
 * The local stand-in for a real mail server: an SMTP server on loopback that keeps every message
 * it receives in the mailbox table, where admins read them. Used when SMTP_URL is unset.
 */
export async function startStandInSmtp(db: Database, port = 0): Promise<{ port: number, close: () => Promise<void> }> {
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS', 'AUTH'],
    size: 5 * 1024 * 1024,
    logger: false,
    onData(stream, session, callback) {
      const chunks: Buffer[] = []
      stream.on('data', (chunk: Buffer) => chunks.push(chunk))
      stream.on('end', () => {
        const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : ''
        db.insert(mailbox)
          .values({
            envelopeFrom,
            envelopeTo: session.envelope.rcptTo.map(r => r.address),
            raw: Buffer.concat(chunks).toString('utf8'),
          })
          .then(
            () => callback(),
            error => callback(error as Error),
          )
      })
    },
  })
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject)
    server.listen(port, '127.0.0.1', () => resolve())
  })
  const address = server.server.address() as { port: number }
  return { port: address.port, close: () => new Promise(resolve => server.close(() => resolve())) }
}
