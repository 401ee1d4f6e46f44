import nodemailer from 'nodemailer'
import type { Transporter, SendMailOptions } from 'nodemailer'
import type { Sequelize } from 'sequelize'
import { QueryTypes } from 'sequelize'

let transporter: Transporter | undefined

/** One SMTP transport per process, from SMTP_URL (the local fake under `npm start` / `npm test`). */
export function mailer(): Transporter {
  if (!transporter) {
    const url = process.env.SMTP_URL
    if (!url) throw new Error('SMTP_URL is not set')
    // Short timeouts: fail fast when the relay is down instead of holding a request for minutes.
    transporter = nodemailer.createTransport({ url, connectionTimeout: 5_000, greetingTimeout: 5_000, socketTimeout: 20_000 } as nodemailer.TransportOptions,
      { from: process.env.MAIL_FROM ?? 'Tautline <no-reply@tautline.test>' })
  }
  return transporter
}

/** Hands one message to the relay, unrecorded: use sendRecordedMail, or record the attempt with recordSentMail. */
export function sendMail(message: SendMailOptions) {
  return mailer().sendMail({ from: process.env.MAIL_FROM ?? 'Tautline <no-reply@tautline.test>', ...message })
}

export function appUrl(path: string) {
  return new URL(path, process.env.APP_URL ?? 'http://127.0.0.1:3000').toString()
}

/** True when the relay accepts a connection and greets us. */
export async function mailReachable() {
  try {
    return await mailer().verify()
  }
  catch {
    return false
  }
}

/** The local mail fake is in use: its messages are shown in the admin's Mailbox. */
export function localMailbox(): boolean {
  return !!process.env.MAIL_DIR
}

export type MailKind = 'invite' | 'reset' | 'report' | 'audit_request'

/** Who a message belongs to: the workspace that caused it, and the signed-in person if there was one. */
export interface MailOrigin {
  workspaceId: number
  causedBy: number | null
  kind: MailKind
}

export interface SentAttachment { fileName: string, sizeBytes: number, contentType: string, reportDispatchId?: number }

function addresses(value: SendMailOptions['to']): string[] {
  const list = Array.isArray(value) ? value : value ? [value] : []
  return list.map(a => (typeof a === 'string' ? a : a.address)).filter(a => !!a)
}

function replyTo(value: SendMailOptions['replyTo']): string | null {
  return addresses(value as SendMailOptions['to'])[0] ?? null
}

function attachmentsOf(message: SendMailOptions, reportDispatchId?: number): SentAttachment[] {
  return (message.attachments ?? []).map(a => ({
    fileName: a.filename || 'attachment',
    sizeBytes: Buffer.isBuffer(a.content) || a.content instanceof Uint8Array ? a.content.byteLength : typeof a.content === 'string' ? Buffer.byteLength(a.content) : 0,
    contentType: a.contentType ?? 'application/octet-stream',
    ...(reportDispatchId ? { reportDispatchId } : {}),
  }))
}

/**
 * Records one message and the outcome of sending it. The text is kept only while the local mail fake is in use
 * (it carries one-use links that are stored elsewhere only as hashes); with a real relay the record keeps who,
 * to whom, what subject and whether it went. A report dispatch has one record, updated on each retry.
 */
export async function recordSentMail(db: Sequelize, origin: MailOrigin, message: SendMailOptions,
  outcome: { status: 'sent' | 'retrying' | 'failed', error?: string | null, reportDispatchId?: number }) {
  const replacements = {
    ws: origin.workspaceId, by: origin.causedBy, kind: origin.kind, recipients: addresses(message.to),
    replyTo: replyTo(message.replyTo), subject: String(message.subject ?? ''), body: localMailbox() && typeof message.text === 'string' ? message.text : null,
    attachments: JSON.stringify(attachmentsOf(message, outcome.reportDispatchId)), dispatch: outcome.reportDispatchId ?? null,
    status: outcome.status, error: outcome.error?.slice(0, 500) ?? null,
  }
  await db.query(`INSERT INTO sent_mail (workspace_id, caused_by, kind, recipients, reply_to, subject, body_text, attachments, report_dispatch_id, status, error)
    VALUES (:ws, :by, :kind, CAST(ARRAY[:recipients] AS text[]), :replyTo, :subject, :body, CAST(:attachments AS jsonb), :dispatch, :status, :error)
    ON CONFLICT (report_dispatch_id) DO UPDATE SET status = EXCLUDED.status, error = EXCLUDED.error,
      attempts = sent_mail.attempts + 1, updated_at = now()`, { type: QueryTypes.INSERT, replacements })
}

/** Sends a message and records it for the workspace that caused it, whether the relay took it or not. */
export async function sendRecordedMail(db: Sequelize, origin: MailOrigin, message: SendMailOptions) {
  try {
    const info = await sendMail(message)
    await recordSentMail(db, origin, message, { status: 'sent' })
    return info
  }
  catch (err) {
    await recordSentMail(db, origin, message, { status: 'failed', error: (err as Error).message ?? String(err) }).catch(() => undefined)
    throw err
  }
}
