import type { Role } from '#shared/types/roles'

export interface NavItem { to: string, labelKey: string, roles?: Role[], signedIn?: boolean }

// Only pages that exist are listed; a role sees only what it can open, and a visitor who has not
// signed in sees only the public pages.
const ITEMS: NavItem[] = [
  { to: '/', labelKey: 'nav.overview', signedIn: true },
  // Sites belong to an organisation that plans: its planners edit them, its readers read them.
  { to: '/sites', labelKey: 'sites.nav', roles: ['planner', 'reader'] },
  // Readers see the issued briefings of their organisation; planners also draft them.
  { to: '/briefings', labelKey: 'briefings.nav', roles: ['planner', 'reader'] },
  { to: '/library', labelKey: 'nav.library' },
  // Anyone signed in may watch sites (their own address); the list lives on this page.
  { to: '/watches', labelKey: 'watches.nav', signedIn: true },
  { to: '/admin/users', labelKey: 'nav.adminUsers', roles: ['admin'] },
  { to: '/admin/invitations', labelKey: 'account.invite.nav', roles: ['admin'] },
  // The stand-in mailbox and the outbox: where admins see what was sent and what failed.
  { to: '/admin/mailbox', labelKey: 'mailbox.nav', roles: ['admin'] },
  { to: '/admin/outbox', labelKey: 'mailbox.outbox.nav', roles: ['admin'] },
  // Recomputations of many sites after new science, with their progress.
  { to: '/admin/recomputations', labelKey: 'recomputations.nav', roles: ['admin'] },
  { to: '/admin/audit', labelKey: 'nav.adminAudit', roles: ['admin'] },
]

export function useNavigation() {
  const { user } = useUserSession()
  return computed(() => ITEMS.filter((item) => {
    if (item.signedIn && !user.value) return false
    return !item.roles || (user.value && item.roles.includes(user.value.role))
  }))
}
