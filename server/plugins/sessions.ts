// Sessions end on the server, not only in the browser that signs out: a copied cookie must stop
// working too. The guards compare the cookie's generation with the user's (server/utils/auth.ts).
export default defineNitroPlugin(() => {
  // Signing out (DELETE /api/_auth/session) ends every session of this person.
  sessionHooks.hook('clear', async (session) => {
    const id = session.user?.id
    if (id && typeof session.generation === 'number') await endSessions(await useDb(), id, session.generation)
  })
  // The browser's view of its session must not show an ended session as signed in.
  sessionHooks.hook('fetch', async (session, event) => {
    if (session.user && !(await optionalUser(event))) {
      await clearUserSession(event)
      throw createError({ statusCode: 401, message: 'This session has ended. Sign in again.' })
    }
  })
})
