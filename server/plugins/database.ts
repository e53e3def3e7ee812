// Open, migrate and (on an empty database) seed at start, so the first request does not wait.
import { databaseOptions } from '~~/server/db/client'
import { dataDirProblemSync } from '~~/server/db/data-dir-lock'

export default defineNitroPlugin((nitroApp) => {
  // A PGlite folder this process cannot have will not get better by waiting: say why and exit
  // non-zero before listening, rather than answer every request with an error. (A PostgreSQL
  // server that is away may come back, so that case keeps running and reports "down".)
  const options = databaseOptions()
  if (!options.url && options.dataDir !== 'memory://') {
    const problem = dataDirProblemSync(options.dataDir)
    if (problem) {
      console.error(`[brinkwater] ${problem}`)
      process.exit(1)
    }
  }
  useDbHandle().catch((error) => {
    console.error('[brinkwater] The database could not be opened:', error instanceof Error ? error.message : error)
    process.exitCode = 1
  })
  nitroApp.hooks.hook('close', async () => {
    // A database that never opened has nothing to close (its error was reported above).
    const handle = await useDbHandle().catch(() => null)
    await handle?.close()
  })
})
