// The user kept in the sealed session cookie: only what guards need, never a password or hash.
declare module '#auth-utils' {
  interface User {
    id: number
    email: string
    name: string
    role: 'admin' | 'officer' | 'installer' | 'manager'
    workspaceId: number
    clientId: number | null
  }
}
export {}
