import { CreateReleaseSchema } from '#shared/schemas/releases'
import { createRelease } from '~~/server/services/releases'

// A new draft: version 1 of a new series, or the next version of an existing one.
export default defineEventHandler(async (event) => {
  const analyst = await requireRole(event, 'analyst')
  const input = await readValidBody(event, CreateReleaseSchema)
  const created = await createRelease(analyst, input)
  setResponseStatus(event, 201)
  return created
})
