import { ResetCompleteSchema } from '#shared/schemas/accounts'
import { completePasswordReset } from '~~/server/services/accounts'

// Set a new password with the e-mailed link (once, within the hour).
export default defineEventHandler(async (event) => {
  await rateLimit(`reset-complete:${clientKey(event)}`, 20, 3_600_000, 'attempts from this connection', event)
  const { token, password } = await readValidBody(event, ResetCompleteSchema)
  await completePasswordReset(token, password)
  return { message: 'Your password is changed. Sign in with it now.' }
})
