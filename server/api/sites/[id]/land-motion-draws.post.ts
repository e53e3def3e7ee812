import { LandMotionDrawsSchema } from '#shared/schemas/sites'
import { IdParams } from '#shared/schemas/params'
import { uploadLandMotionDraws } from '~~/server/services/land-motion-draws'

// A new version of the site's land-motion draws (CSV draw,rate_mm_per_year), optionally joint with a release of draws.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const upload = await readValidBody(event, LandMotionDrawsSchema)
  setResponseStatus(event, 201)
  return uploadLandMotionDraws(planner, id, upload)
})
