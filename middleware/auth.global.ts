// Every page needs a signed-in user except the few that let someone get in.
const publicPaths = new Set(['/login', '/forgot-password', '/reset-password', '/welcome'])

export default defineNuxtRouteMiddleware((to) => {
  const { loggedIn } = useUserSession()
  if (publicPaths.has(to.path)) {
    // A signed-in user has no business on the sign-in page; the token pages stay reachable.
    if (to.path === '/login' && loggedIn.value) return navigateTo('/')
    return
  }
  if (!loggedIn.value) {
    return navigateTo(to.fullPath === '/' ? '/login' : { path: '/login', query: { next: to.fullPath } })
  }
})
