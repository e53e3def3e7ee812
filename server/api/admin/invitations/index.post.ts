import { InvitationSchema } from '#shared/schemas/accounts'
import { inviteUser } from '~~/server/services/accounts'

// Invite someone by e-mail with a role and organisation; they choose their own password.
export default defineEventHandler(async (event) => {
  const admin = await requireAdmin(event)
  const input = await readValidBody(event, InvitationSchema)
  await inviteUser(admin, input)
  setResponseStatus(event, 202)
  return { message: `Invitation sent to ${input.email}.` }
})
