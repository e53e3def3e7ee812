import { IdParams } from '#shared/schemas/params'
import { readLandMotionDraws } from '~~/server/services/land-motion-draws'

// The site's latest land-motion draws as a summary, earlier versions, and the releases they may be joint with.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  return readLandMotionDraws(user, id)
})
