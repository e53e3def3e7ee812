import { ROLES } from '#shared/types/roles'

/** The roles the signed-in person may give: only the operator may make another operator (the API refuses too). */
export function useGrantableRoles() {
  const { user } = useUserSession()
  return computed(() => user.value?.role === 'operator' ? [...ROLES] : ROLES.filter(role => role !== 'operator'))
}
