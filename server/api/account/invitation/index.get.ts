import { TokenQuery } from '#shared/schemas/accounts'
import { describeInvitation } from '~~/server/services/accounts'

// What an invitation link offers (public: the token is the key).
export default defineEventHandler(async (event) => {
  const { token } = readValidQuery(event, TokenQuery)
  return describeInvitation(token)
})
