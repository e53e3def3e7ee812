import { AdoptionSchema } from '#shared/schemas/adoptions'
import { IdParams } from '#shared/schemas/params'
import { adopt } from '~~/server/services/adoptions'

// Adopts, for one scenario, series of releases per component and whose correlation sets the
// organisation's outlooks use. Planners and administrators of the organisation (the operator for
// their own); another organisation's answers 404.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  if (user.role !== 'planner' && user.role !== 'admin' && user.role !== 'operator') {
    throw createError({
      statusCode: 403,
      message: 'This needs the planner role, or an administrator of the organisation.',
    })
  }
  const { id } = readValidParams(event, IdParams)
  const input = await readValidBody(event, AdoptionSchema)
  return adopt(user, id, input)
})
