import type { Role } from './labels'

export interface NavItem { to: string, label: string, icon: string }

const sites: NavItem = { to: '/sites', label: 'Sites', icon: 'sites' }
const clients: NavItem = { to: '/clients', label: 'Clients', icon: 'clients' }
const activity: NavItem = { to: '/activity', label: 'Activity', icon: 'activity' }

// Each role sees only the places it can use; the home page is named for what it shows that role.
const byRole: Record<Role, NavItem[]> = {
  installer: [{ to: '/', label: 'Today', icon: 'today' }, sites],
  officer: [{ to: '/', label: 'Overview', icon: 'overview' }, sites, clients, activity],
  manager: [{ to: '/', label: 'Portfolio', icon: 'portfolio' }, sites],
  admin: [
    { to: '/', label: 'Overview', icon: 'overview' }, sites, clients,
    { to: '/users', label: 'Users', icon: 'users' }, activity,
    { to: '/mailbox', label: 'Mailbox', icon: 'mail' },
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
