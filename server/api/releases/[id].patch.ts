import { UpdateReleaseSchema } from '#shared/schemas/releases'
import { IdParams } from '#shared/schemas/params'
import { updateRelease } from '~~/server/services/releases'

// Edit a draft (only drafts change; a later state answers 409).
export default defineEventHandler(async (event) => {
  const analyst = await requireRole(event, 'analyst')
  const { id } = readValidParams(event, IdParams)
  const input = await readValidBody(event, UpdateReleaseSchema)
  return updateRelease(analyst, id, input)
})
