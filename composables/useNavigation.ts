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
  // Which published science the organisation's outlooks use; planners and admins change it.
  { to: '/adoption', labelKey: 'adoption.nav', roles: ['planner', 'reader', 'admin', 'operator'] },
  // Anyone signed in may watch sites (their own address); the list lives on this page.
  { to: '/watches', labelKey: 'watches.nav', signedIn: true },
  // An organisation's admins keep its people, outbox and audit; the operator keeps every organisation's.
  { to: '/admin/users', labelKey: 'nav.adminUsers', roles: ['admin', 'operator'] },
  { to: '/admin/invitations', labelKey: 'account.invite.nav', roles: ['admin', 'operator'] },
  // The demo's stand-in mailbox holds everyone's reset links: the operator's alone.
  { to: '/admin/mailbox', labelKey: 'mailbox.nav', roles: ['operator'] },
  { to: '/admin/outbox', labelKey: 'mailbox.outbox.nav', roles: ['admin', 'operator'] },
  // Recomputations of every organisation's sites after new science, with their progress.
  { to: '/admin/recomputations', labelKey: 'recomputations.nav', roles: ['operator'] },
  { to: '/admin/audit', labelKey: 'nav.adminAudit', roles: ['admin', 'operator'] },
]

export function useNavigation() {
  const { user } = useUserSession()
  return computed(() => ITEMS.filter((item) => {
    if (item.signedIn && !user.value) return false
    return !item.roles || (user.value && item.roles.includes(user.value.role))
  }))
}
