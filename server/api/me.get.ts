// The signed-in user as the database has them now; the client refreshes its session view from here.
export default defineEventHandler(async (event) => {
  const user = await requireUser(event)
  await refreshSessionSnapshot(event, user)
  return { user }
})
