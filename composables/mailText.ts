// Words and links for the admin's Mailbox, which shows the workspace's record of the mail it sent.
import type { MailKind, MailStatus } from './rows'

export const mailKindLabels: Record<MailKind, string> = {
  invite: 'Invitation',
  reset: 'Password reset',
  report: 'Site report',
  audit_request: 'Audit request',
}

export const mailStatusLabels: Record<MailStatus, string> = {
  sent: 'Handed to the mail server',
  retrying: 'Not sent yet: will retry',
  failed: 'Not sent',
}

/** The web addresses in a message's text, each once, in order. */
export function linksIn(text: string | null): string[] {
  return [...new Set(text?.match(/https?:\/\/[^\s<>"]+/g) ?? [])]
}

/** A link to this app's own sign-in pages opens here as a path; anything else stays a plain URL. */
export function appPathOf(url: string): string | null {
  try {
    const u = new URL(url)
    return ['/welcome', '/reset-password', '/login'].includes(u.pathname) ? `${u.pathname}${u.search}` : null
  }
  catch {
    return null
  }
}
