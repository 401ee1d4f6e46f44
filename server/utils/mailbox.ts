import { canAdminister } from '#shared/access'
import type { H3Event } from 'h3'

// The Mailbox exists only while the local mail fake is in use (MAIL_DIR set). It reads the record of the mail
// this workspace caused (sent_mail), never the fake's folder, and never decides by the address a message went to.

/** The admin of a workspace that has a local mailbox; 404 when mail goes to a real relay. */
export async function requireMailboxAdmin(event: H3Event) {
  const admin = await requireRole(event, canAdminister)
  if (!process.env.MAIL_DIR) throw createError({ statusCode: 404, message: 'No local mailbox: mail goes to a real SMTP relay here' })
  return admin
}
