interface MeResponse {
  workspace: { id: number, name: string } | null
  client: { id: number, name: string } | null
}

/** The signed-in user's workspace and (for a manager) client names, fetched once and shared by key. */
export function useMe() {
  const { loggedIn } = useUserSession()
  // No watch on the session: signing out must not refetch (it would only get a 401); sign-out clears this data.
  return useFetch<MeResponse>('/api/me', {
    key: 'me',
    pick: ['workspace', 'client'],
    immediate: loggedIn.value,
    watch: false,
  })
}
