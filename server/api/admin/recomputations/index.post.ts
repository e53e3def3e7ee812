import { RecomputationRequestSchema } from '#shared/schemas/recomputations'
import { requestRecomputation } from '~~/server/services/recompute'
import { scenarioCoverage } from '~~/server/services/site-list'

// Recompute every site's latest outlooks for a scenario (or all scenarios): after an engine
// upgrade, say. Outlooks whose inputs have not changed are found in the store and left alone.
export default defineEventHandler(async (event) => {
  const admin = await requireOperator(event)
  const { scenario } = await readValidBody(event, RecomputationRequestSchema)
  if (scenario && !(await scenarioCoverage()).some(s => s.scenario === scenario)) {
    throw createError({
      statusCode: 400,
      message: `scenario: There is no scenario called ${scenario}; choose one from the list.`,
      data: { issues: [{ field: 'scenario', message: 'Choose a scenario from the list.' }] },
    })
  }
  const id = await requestRecomputation(admin, { scenario, cause: { kind: 'requested', scenario } })
  kickJobs()
  setResponseStatus(event, 202)
  return { id }
})
