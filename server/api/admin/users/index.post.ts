import { createUser } from '~~/server/services/users'
import { CreateUserSchema } from '#shared/schemas/users'

export default defineEventHandler(async (event) => {
  const admin = await requireAdmin(event)
  const input = await readValidBody(event, CreateUserSchema)
  const user = await createUser(admin, input)
  setResponseStatus(event, 201)
  return user
})
