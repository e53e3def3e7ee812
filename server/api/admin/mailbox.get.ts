import { LimitQuery } from '#shared/schemas/params'
import { readMailbox } from '~~/server/services/mail-admin'

const Query = LimitQuery(200, 50)

// What the local stand-in SMTP server received, newest first, parsed for reading. It holds every
// reset and invitation link the instance sent, so only the operator reads it, and only on the demo:
// with a real mail server (SMTP_URL) mail belongs in people's own inboxes.
export default defineEventHandler(async (event) => {
  await requireOperator(event)
  if (serverConfig().SMTP_URL)
    throw createError({ statusCode: 404, message: 'No such mailbox: mail goes to the mail server set in SMTP_URL.' })
  const { limit } = readValidQuery(event, Query)
  return readMailbox(limit)
})
