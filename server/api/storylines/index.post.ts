import { CreateStorylineSchema } from '#shared/schemas/releases'
import { createStoryline } from '~~/server/services/science-records'

// A draft storyline (a named set of component values by year), reviewed like a release.
export default defineEventHandler(async (event) => {
  const analyst = await requireRole(event, 'analyst')
  const input = await readValidBody(event, CreateStorylineSchema)
  const created = await createStoryline(analyst, input)
  setResponseStatus(event, 201)
  return created
})
