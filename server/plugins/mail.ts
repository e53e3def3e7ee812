// Sends the outbox: at start, whenever mail is queued, and on a timer for retries.
export default defineNitroPlugin((nitroApp) => {
  const every = Number(process.env.MAIL_POLL_MS) || 2_000
  const timer = setInterval(kickMail, every)
  timer.unref()
  kickMail()
  nitroApp.hooks.hook('close', () => clearInterval(timer))
})
