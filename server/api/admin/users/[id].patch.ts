import { updateUser } from '~~/server/services/users'
import { IdParams } from '#shared/schemas/params'
import { UpdateUserSchema } from '#shared/schemas/users'

// Change a user's role, name or whether they may sign in; the last admin cannot be locked out.
export default defineEventHandler(async (event) => {
  const admin = await requireAdmin(event)
  const { id } = readValidParams(event, IdParams)
  const patch = await readValidBody(event, UpdateUserSchema)
  return updateUser(admin, id, patch)
})
