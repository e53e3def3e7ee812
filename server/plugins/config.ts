// Checks every environment variable before anything else starts (plugins run in file-name order,
// and this one sorts first): a value the server cannot use will not get better by waiting, so say
// which variable and what to give, and exit non-zero before listening.
export default defineNitroPlugin(() => {
  try {
    loadServerConfig({ requireSessionPassword: !import.meta.dev })
  }
  catch (error) {
    if (!(error instanceof ConfigError)) throw error
    for (const problem of error.problems) console.error(`[brinkwater] ${problem}`)
    process.exit(1)
  }
})
