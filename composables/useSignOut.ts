/** Ends the session, forgets this browser's cached rows and recent sites, and returns to sign-in. */
export function useSignOut() {
  const { clear } = useUserSession()
  const recent = useRecentSitesStore()
  const busy = ref(false)

  async function signOut() {
    busy.value = true
    try {
      // The server may already have ended the session; signing out must still work then.
      await $fetch('/api/auth/logout', { method: 'POST' }).catch(() => null)
      await clear()
      recent.forget()
      clearNuxtData()
      await navigateTo('/login')
    }
    finally {
      busy.value = false
    }
  }

  return { busy, signOut }
}
