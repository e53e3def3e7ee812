import { IdParams } from '#shared/schemas/users'
import { getOutlookJson } from '~~/server/services/outlook-read'

// One outlook with its provenance, its progress while running, and whether newer science exists.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  const json = await getOutlookJson(user, id)
  setResponseHeader(event, 'content-type', 'application/json')
  return json
})
