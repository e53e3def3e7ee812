import type { Role } from '#shared/types/roles'

// Convenience only: it spares a signed-out user a page that would refuse them. Every API route
// guards itself on the server.
export default defineNuxtRouteMiddleware((to) => {
  if (to.meta.public) return
  const { loggedIn, user } = useUserSession()
  if (!loggedIn.value) {
    return navigateTo({ path: '/sign-in', query: to.fullPath !== '/' ? { next: to.fullPath } : {} })
  }
  const roles = to.meta.roles as Role[] | undefined
  // The server has already answered this page with the 403 page; refusing again while the browser
  // hydrates it would only log an uncaught error in the console.
  if (import.meta.client && useNuxtApp().isHydrating && useError().value) return
  if (roles && user.value && !roles.includes(user.value.role)) {
    throw createError({ statusCode: 403, message: 'forbidden' })
  }
})
