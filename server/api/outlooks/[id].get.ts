import { IdParams } from '#shared/schemas/users'
import { getOutlook } from '~~/server/services/outlook-read'

// One outlook with its provenance, its progress while running, and whether newer science exists.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  return getOutlook(user, id)
})
