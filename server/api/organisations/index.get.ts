import { organisationsForPeople } from '~~/server/services/users'

// Organisations are chosen when someone is created or invited: an admin can choose only their own.
export default defineEventHandler(async (event) => {
  const admin = await requireAdmin(event)
  return organisationsForPeople(admin)
})
