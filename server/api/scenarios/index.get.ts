import { scenarioCoverage } from '~~/server/services/site-list'

// Scenarios an outlook can use now: those with a published release of every component.
export default defineEventHandler(async () => scenarioCoverage())
