import { ResetRequestSchema } from '#shared/schemas/accounts'
import { requestPasswordReset } from '~~/server/services/accounts'

const HOUR = 3_600_000

// Ask for a reset link. The answer is the same whether or not the address has an account.
export default defineEventHandler(async (event) => {
  await rateLimit(`reset:client:${clientKey(event)}`, 20, HOUR, 'reset requests from this connection', event)
  const { email, language } = await readValidBody(event, ResetRequestSchema)
  await rateLimit(`reset:email:${email}`, 3, HOUR, 'reset requests for this address', event)
  await requestPasswordReset(email, language)
  setResponseStatus(event, 202)
  return {
    message:
      'If that address has an account, a link to choose a new password is on its way. It works once, for one hour.',
  }
})
