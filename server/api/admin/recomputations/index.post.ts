import { RecomputationRequestSchema } from '#shared/schemas/recomputations'
import { startRecomputation } from '~~/server/services/recompute'
import { scenarioCoverage } from '~~/server/services/site-list'

// Recompute every site's latest outlooks for a scenario (or all scenarios): after an engine
// upgrade, say. Outlooks whose inputs have not changed are found in the store and left alone.
export default defineEventHandler(async (event) => {
  const admin = await requireOperator(event)
  const { scenario } = await readValidBody(event, RecomputationRequestSchema)
  if (scenario && !(await scenarioCoverage()).some(s => s.scenario === scenario)) {
    throw createError({ statusCode: 400, message: `scenario: There is no scenario called ${scenario}; choose one from the list.`, data: { issues: [{ field: 'scenario', message: 'Choose a scenario from the list.' }] } })
  }
  const db = await useDb()
  const id = await db.transaction(async (tx) => {
    const batchId = await startRecomputation(tx, { scenario, cause: { kind: 'requested', scenario }, requestedBy: admin.id })
    await writeAudit(tx, admin, 'recomputation.started', { type: 'recomputation', id: batchId }, { scenario })
    return batchId
  })
  kickJobs()
  setResponseStatus(event, 202)
  return { id }
})
