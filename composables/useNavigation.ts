import type { Role } from './labels'

export interface NavItem { to: string, label: string, icon: string }

const sites: NavItem = { to: '/sites', label: 'Sites', icon: 'sites' }
const clients: NavItem = { to: '/clients', label: 'Clients', icon: 'clients' }
const activity: NavItem = { to: '/activity', label: 'Activity', icon: 'activity' }
const fit: NavItem = { to: '/fit', label: 'Fit', icon: 'ruler' }
const rulebook: NavItem = { to: '/rulebook', label: 'Rulebook', icon: 'shield' }
const remedies: NavItem = { to: '/remedies', label: 'Remedies', icon: 'check' }
const imports: NavItem = { to: '/imports', label: 'Imports', icon: 'plus' }

// Each role sees only the places it can use; the home page is named for what it shows that role.
const byRole: Record<Role, NavItem[]> = {
  installer: [{ to: '/', label: 'Today', icon: 'today' }, fit, sites, remedies, rulebook],
  officer: [{ to: '/', label: 'Overview', icon: 'overview' }, fit, sites, remedies, clients, imports, activity, rulebook],
  manager: [{ to: '/', label: 'Portfolio', icon: 'portfolio' }, sites, imports, remedies, rulebook],
  admin: [
    { to: '/', label: 'Overview', icon: 'overview' }, fit, sites, remedies, clients, imports,
    { to: '/users', label: 'Users', icon: 'users' }, activity,
    { to: '/mailbox', label: 'Mailbox', icon: 'mail' }, rulebook,
  ],
}

export function useNavigation() {
  const { user } = useUserSession()
  const route = useRoute()
  const items = computed(() => (user.value ? byRole[user.value.role] : []))
  /** Home matches only itself; other items also match their sub-pages (a site under Sites). */
  const isActive = (item: NavItem) => (item.to === '/' ? route.path === '/' : route.path.startsWith(item.to))
  return { items, isActive }
}
