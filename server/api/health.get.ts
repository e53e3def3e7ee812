import { checkHealth } from '~~/server/services/health'

// Public on purpose (load balancers and monitors ask it without signing in), so it reports only
// kinds, counts and ages: no hosts, addresses or secrets. 503 when the database does not answer.
export default defineEventHandler(async (event) => {
  const health = await checkHealth()
  if (health.status === 'down') setResponseStatus(event, 503)
  setResponseHeader(event, 'cache-control', 'no-store')
  return health
})
