import { CreateScaleFactorGridSchema } from '#shared/schemas/releases'
import { createScaleFactorGrid } from '~~/server/services/science-records'

export default defineEventHandler(async (event) => {
  const analyst = await requireRole(event, 'analyst')
  const input = await readValidBody(event, CreateScaleFactorGridSchema)
  const created = await createScaleFactorGrid(analyst, input)
  setResponseStatus(event, 201)
  return created
})
