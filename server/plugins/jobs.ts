import { kickBackgroundWork } from '../services/background'

// Runs background jobs and queued outlooks: at start (work left by a stopped or crashed instance
// is taken over once its lease runs out), whenever work is queued here, and on a timer for work
// queued by other instances and for jobs waiting on outlooks.
export default defineNitroPlugin((nitroApp) => {
  setJobRunner(kickBackgroundWork)
  const timer = setInterval(kickBackgroundWork, serverConfig().JOBS_POLL_MS)
  timer.unref()
  kickBackgroundWork()
  nitroApp.hooks.hook('close', () => clearInterval(timer))
})
