import { AcceptInvitationSchema } from '#shared/schemas/accounts'
import { acceptInvitation } from '~~/server/services/accounts'

// Accept an invitation: the account is created with the chosen password and signed in.
export default defineEventHandler(async (event) => {
  await rateLimit(`invitation:${clientKey(event)}`, 20, 3_600_000, 'attempts from this connection', event)
  const { token, password } = await readValidBody(event, AcceptInvitationSchema)
  const id = await acceptInvitation(token, password)
  const user = await startSession(event, id)
  setResponseStatus(event, 201)
  return { user }
})
