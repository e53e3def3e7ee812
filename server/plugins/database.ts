// Open, migrate and (on an empty database) seed at start, so the first request does not wait.
export default defineNitroPlugin((nitroApp) => {
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
