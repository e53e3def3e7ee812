import { CreateCorrelationSetSchema } from '#shared/schemas/releases'
import { createCorrelationSet } from '~~/server/services/science-records'

export default defineEventHandler(async (event) => {
  const analyst = await requireRole(event, 'analyst')
  const input = await readValidBody(event, CreateCorrelationSetSchema)
  const created = await createCorrelationSet(analyst, input)
  setResponseStatus(event, 201)
  return created
})
