import { AnnualMaximaSchema } from '#shared/schemas/sites'
import { IdParams } from '#shared/schemas/params'
import { replaceAnnualMaxima } from '~~/server/services/sites'

// Annual maximum water levels (CSV year,value) → a Gumbel fit whose location moves in time, stored on the site.
export default defineEventHandler(async (event) => {
  const planner = await requireRole(event, 'planner')
  const { id } = readValidParams(event, IdParams)
  const { csv } = await readValidBody(event, AnnualMaximaSchema)
  const { fit, sampleSize, referenceEpoch } = await replaceAnnualMaxima(planner, id, csv)
  return {
    gumbel: { location: fit.location, scale: fit.scale, trendPerYear: fit.trendPerYear, se: fit.se },
    referenceEpoch,
    sampleSize,
    method: 'maximum likelihood, location linear in time',
  }
})
