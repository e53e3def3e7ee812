import { listUsers } from '~~/server/services/users'

// An admin sees their organisation's people; the operator sees everyone's.
export default defineEventHandler(async (event) => {
  const admin = await requireAdmin(event)
  return listUsers(admin)
})
