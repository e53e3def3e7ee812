// Sends the outbox: at start, whenever mail is queued, and on a timer for retries.
export default defineNitroPlugin((nitroApp) => {
  const timer = setInterval(kickMail, serverConfig().MAIL_POLL_MS)
  timer.unref()
  kickMail()
  nitroApp.hooks.hook('close', () => clearInterval(timer))
})
