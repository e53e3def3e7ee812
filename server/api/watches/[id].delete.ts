import { IdParams } from '#shared/schemas/params'
import { stopOwnWatch } from '~~/server/services/watches'

// Stop one of your own watches.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  const { id } = readValidParams(event, IdParams)
  await stopOwnWatch(user, id)
  return { stopped: true }
})
