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

export type MailKind = 'invite' | 'reset' | 'report' | 'audit_request'
export type MailStatus = 'sent' | 'retrying' | 'failed'

/** One message of the workspace's record of sent mail (the Mailbox list). */
export interface MailItem {
  id: number
  kind: MailKind
  to: string[]
  subject: string
  status: MailStatus
  attachmentCount: number
  createdAt: string
}

/** One message as a person reads it: the text as sent, and attachments as links. */
export interface MailMessage {
  id: number
  kind: MailKind
  to: string[]
  from: string
  replyTo: string | null
  subject: string
  status: MailStatus
  error: string | null
  attempts: number
  createdAt: string
  causedBy: { id: number, name: string } | null
  text: string | null
  attachments: Array<{ index: number, fileName: string, sizeBytes: number, contentType: string, url: string }>
}
