// Shapes of API replies that shared/types does not declare yet (users, mailbox). Kept in one place
// so they can move to shared/types/register.ts when the server declares them.
import type { Role } from './labels'

export interface UserRow {
  id: number
  email: string
  name: string
  role: Role
  active: boolean
  clientId: number | null
  clientName: string | null
  lastSignInAt: string | null
  invitePending: boolean
}

export interface MailItem {
  name: string
  to: string | null
  subject: string | null
  date: string | null
  sizeBytes: number
}

export interface MailMessage {
  name: string
  to: string | null
  subject: string | null
  date: string | null
  raw: string
}
