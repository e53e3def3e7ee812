import { IdParams } from '#shared/schemas/params'
import { getRelease } from '~~/server/services/releases'

// Full distribution and provenance; drafts only within their organisation (404 elsewhere).
export default defineEventHandler(async (event) => {
  const viewer = await optionalUser(event)
  const { id } = readValidParams(event, IdParams)
  const release = await getRelease(viewer, id)
  const actions = viewer ? reviewActionsFor(viewer, release) : []
  return { ...release, actions }
})
