import type { Role } from '#shared/types/roles'

export interface NavItem { to: string, labelKey: string, roles?: Role[] }

// Only pages that exist are listed; a role sees only what it can open.
const ITEMS: NavItem[] = [
  { to: '/', labelKey: 'nav.overview' },
  { to: '/admin/users', labelKey: 'nav.adminUsers', roles: ['admin'] },
  { to: '/admin/audit', labelKey: 'nav.adminAudit', roles: ['admin'] },
]

export function useNavigation() {
  const { user } = useUserSession()
  return computed(() => ITEMS.filter(item => !item.roles || (user.value && item.roles.includes(user.value.role))))
}
