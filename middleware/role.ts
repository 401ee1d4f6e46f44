import type { RoleSet } from '#shared/access'

declare module '#app' {
  interface PageMeta {
    /** Roles allowed on the page; checked by the `role` route middleware. */
    roles?: RoleSet
  }
}

// Pages name their role set from #shared/access: definePageMeta({ middleware: 'role', roles: canFit }); others get a 403 page.
export default defineNuxtRouteMiddleware((to) => {
  const { user } = useUserSession()
  const allowed = to.meta.roles
  if (!allowed?.length || (user.value && allowed.includes(user.value.role))) return
  return abortNavigation(createError({
    statusCode: 403,
    statusMessage: 'Not available to your role',
    message: 'This page is for other roles in your workspace. Your own pages are in the menu.',
    fatal: true,
  }))
})
