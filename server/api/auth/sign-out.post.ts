// Signing out is always allowed and always succeeds, signed in or not.
export default defineEventHandler(async (event) => {
  await clearUserSession(event)
  return { signedOut: true }
})
