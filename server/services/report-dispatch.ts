import { createHash, randomUUID } from 'node:crypto'
import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import type { SendMailOptions } from 'nodemailer'
import { z } from 'zod'
import { logActivity } from './activity'
import { recordSentMail, sendMail } from './mail'
import { paged } from './paged'
import { REPORT_CAUTION, REPORT_HAZARD, buildSiteReport, formatDay, reportFileName } from './report'
import { StorageUnavailableError, deleteObject, getObjectBytes, putObject } from './storage'

// Sending a site's report to the client: the PDF is stored in S3 and recorded before the first attempt, so a
// failed send is never lost. Queued rows are retried with back-off by any server process (FOR UPDATE SKIP LOCKED).

/** Attempts in all, the first included, before a dispatch is given up as failed. */
export const MAX_ATTEMPTS = 8
/** Wait after the first failed attempt; each later failure doubles it (REPORT_RETRY_BASE_MS, 30 s by default). */
export const RETRY_BASE_MS = Number(process.env.REPORT_RETRY_BASE_MS) > 0 ? Number(process.env.REPORT_RETRY_BASE_MS) : 30_000
/** How long a claimed row stays hidden from other workers while one of them sends it. */
const LEASE_MS = 10 * 60_000

export type SendFn = (message: SendMailOptions) => Promise<{ messageId?: string }>

export const reportEmailSchema = z.object({
  to: z.string({ error: 'to must be an e-mail address' }).trim().toLowerCase().max(254, 'to is at most 254 characters')
    .pipe(z.email({ error: 'to must be an e-mail address' })).optional(),
})

export function retryDelayMs(attempts: number): number {
  return RETRY_BASE_MS * 2 ** Math.max(0, attempts - 1)
}

export function reportSubject(site: { name: string, ref: string }, generatedOn: string): string {
  return `Cord-safety report: ${site.name} (${site.ref}), ${formatDay(generatedOn, true)}`
}

export interface DispatchJson {
  id: number
  siteId: number
  sentBy: { id: number, name: string }
  to: string
  subject: string
  fileName: string
  sizeBytes: number
  sha256: string
  status: 'queued' | 'sent' | 'failed'
  attempts: number
  lastError: string | null
  createdAt: string
  sentAt: string | null
  nextAttemptAt: string | null
}

const dispatchSelect = `d.id, d.site_id AS "siteId", json_build_object('id', u.id, 'name', u.name) AS "sentBy", d.sent_to AS "to",
  d.subject, d.file_name AS "fileName", d.size_bytes AS "sizeBytes", d.sha256, d.status, d.attempts, d.last_error AS "lastError",
  d.created_at AS "createdAt", d.sent_at AS "sentAt", CASE WHEN d.status = 'queued' THEN d.next_attempt_at END AS "nextAttemptAt"`

export async function getDispatch(db: Sequelize, id: number): Promise<DispatchJson | null> {
  const [row] = await db.query<DispatchJson>(`SELECT ${dispatchSelect} FROM report_dispatches d JOIN users u ON u.id = d.sent_by WHERE d.id = :id`,
    { type: QueryTypes.SELECT, replacements: { id } })
  return row ?? null
}

/** The reports sent for a site, newest first. Callers check tenancy first. */
export async function listDispatches(db: Sequelize, siteId: number, p: { page: number, pageSize: number }) {
  return paged<DispatchJson>(db, dispatchSelect, 'report_dispatches d JOIN users u ON u.id = d.sent_by', ['d.site_id = :siteId'],
    'd.created_at DESC, d.id DESC', { siteId }, p, 'report_dispatches d')
}

/** What a message needs besides the PDF, read back from the dispatch so a retry writes the same e-mail. */
interface MessageContext {
  id: number
  workspaceId: number
  siteId: number
  sentBy: number
  to: string
  subject: string
  fileName: string
  objectKey: string | null
  attempts: number
  createdOn: string
  siteName: string
  siteRef: string
  siteAddress: string
  contactName: string | null
  businessName: string
  senderName: string
  senderEmail: string
}

async function messageContexts(db: Sequelize, ids: number[]): Promise<MessageContext[]> {
  if (!ids.length) return []
  return db.query<MessageContext>(`SELECT d.id, d.workspace_id AS "workspaceId", d.site_id AS "siteId", d.sent_by AS "sentBy", d.sent_to AS "to", d.subject,
      d.file_name AS "fileName", d.object_key AS "objectKey", d.attempts, to_char(d.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS "createdOn",
      s.name AS "siteName", s.ref AS "siteRef", s.address AS "siteAddress", cl.contact_name AS "contactName", w.name AS "businessName",
      u.name AS "senderName", u.email AS "senderEmail"
    FROM report_dispatches d JOIN sites s ON s.id = d.site_id JOIN clients cl ON cl.id = s.client_id
    JOIN workspaces w ON w.id = d.workspace_id JOIN users u ON u.id = d.sent_by
    WHERE d.id IN (:ids) ORDER BY d.id`, { type: QueryTypes.SELECT, replacements: { ids } })
}

function composeMessage(m: MessageContext, pdf: Uint8Array): SendMailOptions {
  const text = [
    m.contactName ? `Hello ${m.contactName},` : 'Hello,',
    `Attached is the window covering cord-safety report for ${m.siteName} (${m.siteRef}), ${m.siteAddress}, prepared on ${formatDay(m.createdOn, true)} by ${m.businessName}.`,
    'It lists every covering in place with the verdict of its latest inspection and, for each non-compliant covering, the measurements against the limits, the clause it fails with its source, and the remedy to make.',
    REPORT_HAZARD,
    REPORT_CAUTION,
    `Sent by ${m.senderName} for ${m.businessName}; a reply reaches them.`,
  ].join('\n\n')
  return {
    to: m.to,
    replyTo: { name: m.senderName, address: m.senderEmail },
    subject: m.subject,
    text: `${text}\n`,
    attachments: [{ filename: m.fileName, content: Buffer.from(pdf), contentType: 'application/pdf' }],
  }
}

function describeError(err: unknown): string {
  const e = err as { code?: string, responseCode?: number, message?: string }
  const detail = [e.code, e.responseCode].filter(Boolean).join(' ')
  return `${detail ? `${detail}: ` : ''}${e.message ?? String(err)}`.slice(0, 500)
}

type Outcome = 'sent' | 'queued' | 'failed'

/** Records a failed attempt: queued again after a back-off, or given up once the attempts are spent. */
async function recordFailure(db: Sequelize, m: MessageContext, error: string, now: Date, giveUp = false): Promise<Outcome> {
  const attempts = m.attempts + 1
  const failed = giveUp || attempts >= MAX_ATTEMPTS
  await db.query(`UPDATE report_dispatches SET attempts = :attempts, last_error = :error, status = :status, next_attempt_at = :next WHERE id = :id`,
    { replacements: { id: m.id, attempts, error, status: failed ? 'failed' : 'queued', next: new Date(now.getTime() + retryDelayMs(attempts)) } })
  // The workspace's record of the message, if it has one yet, follows the dispatch.
  await db.query(`UPDATE sent_mail SET status = :status, error = :error, updated_at = now() WHERE report_dispatch_id = :id`,
    { replacements: { id: m.id, error, status: failed ? 'failed' : 'retrying' } })
  // The log notes when a report first misses its recipient and when it is given up, not every retry.
  if (failed || attempts === 1) {
    await logActivity({ workspaceId: m.workspaceId, userId: m.sentBy, action: failed ? 'report.failed' : 'report.queued', entity: 'site',
      entityId: m.siteId, detail: { dispatchId: m.id, to: m.to, attempts, error } })
  }
  return failed ? 'failed' : 'queued'
}

async function attempt(db: Sequelize, m: MessageContext, pdf: Uint8Array, send: SendFn, now: Date): Promise<Outcome> {
  let messageId: string | null
  const message = composeMessage(m, pdf)
  // The workspace's record of the message: one per dispatch, updated on each attempt.
  const origin = { workspaceId: m.workspaceId, causedBy: m.sentBy, kind: 'report' as const }
  try {
    const info = await send(message)
    messageId = info.messageId ?? null
  }
  catch (err) {
    const error = describeError(err)
    const outcome = await recordFailure(db, m, error, now)
    await recordSentMail(db, origin, message, { status: outcome === 'failed' ? 'failed' : 'retrying', error, reportDispatchId: m.id })
    return outcome
  }
  await recordSentMail(db, origin, message, { status: 'sent', reportDispatchId: m.id })
  await db.query(`UPDATE report_dispatches SET status = 'sent', attempts = attempts + 1, sent_at = now(), message_id = :messageId, last_error = NULL
    WHERE id = :id`, { replacements: { id: m.id, messageId } })
  await logActivity({ workspaceId: m.workspaceId, userId: m.sentBy, action: 'report.sent', entity: 'site', entityId: m.siteId,
    detail: { dispatchId: m.id, to: m.to, attempts: m.attempts + 1 } })
  return 'sent'
}

/**
 * Draws the site's report, stores it in S3, records the dispatch and makes the first attempt to send it.
 * The answer says whether it went or is queued for a retry. S3 being down throws StorageUnavailableError, with
 * nothing recorded. Callers check role and tenancy first.
 */
export async function emailSiteReport(db: Sequelize, args: { actor: { id: number }, siteId: number, to?: string, send?: SendFn }) {
  const { data, pdf } = await buildSiteReport(db, args.siteId)
  const sha256 = createHash('sha256').update(pdf).digest('hex')
  const objectKey = `w${data.site.workspaceId}/s${data.site.id}/reports/${randomUUID()}.pdf`
  await putObject(objectKey, pdf, 'application/pdf', sha256)
  let id: number
  try {
    // Hidden from the retry workers until this request has made its own first attempt.
    const [row] = await db.query<{ id: number }>(`INSERT INTO report_dispatches
        (workspace_id, site_id, sent_by, sent_to, subject, file_name, size_bytes, sha256, status, attempts, object_key, next_attempt_at)
      VALUES (:workspaceId, :siteId, :sentBy, :to, :subject, :fileName, :size, :sha256, 'queued', 0, :objectKey, now() + make_interval(secs => :leaseS))
      RETURNING id`, { type: QueryTypes.SELECT, replacements: {
      workspaceId: data.site.workspaceId, siteId: data.site.id, sentBy: args.actor.id, to: args.to ?? data.client.reportEmail,
      subject: reportSubject(data.site, data.generatedOn), fileName: reportFileName(data.site.ref, data.generatedOn), size: pdf.byteLength,
      sha256, objectKey, leaseS: LEASE_MS / 1000,
    } })
    id = row!.id
  }
  catch (err) {
    await deleteObject(objectKey).catch(() => undefined)
    throw err
  }
  const [context] = await messageContexts(db, [id])
  const outcome = await attempt(db, context!, pdf, args.send ?? sendMail, new Date())
  return { outcome, dispatch: (await getDispatch(db, id))! }
}

/**
 * One round of the retry worker: claims due queued dispatches (skipping rows another process holds), and sends
 * each from its stored PDF. `now` stands for the clock, so a caller can run the round as of a later time.
 */
export async function retryQueuedReportMails(db: Sequelize, opts: { send?: SendFn, now?: Date, batch?: number } = {}) {
  const now = opts.now ?? new Date()
  const send = opts.send ?? sendMail
  const claimed = await db.query<{ id: number }>(`UPDATE report_dispatches SET next_attempt_at = :lease
    WHERE id IN (SELECT id FROM report_dispatches WHERE status = 'queued' AND next_attempt_at <= :now
      ORDER BY next_attempt_at, id LIMIT :batch FOR UPDATE SKIP LOCKED)
    RETURNING id`, { type: QueryTypes.SELECT, replacements: { now, lease: new Date(now.getTime() + LEASE_MS), batch: opts.batch ?? 10 } })
  const tally = { claimed: claimed.length, sent: 0, queued: 0, failed: 0 }
  for (const m of await messageContexts(db, claimed.map(r => r.id))) {
    let pdf: Uint8Array
    try {
      if (!m.objectKey) throw new Error('no stored PDF')
      pdf = await getObjectBytes(m.objectKey)
    }
    catch (err) {
      // The store being down is worth another try; a missing file never comes back.
      const reachable = !(err instanceof StorageUnavailableError)
      tally[await recordFailure(db, m, `the stored report could not be read: ${describeError(err)}`, now, reachable)]++
      continue
    }
    tally[await attempt(db, m, pdf, send, now)]++
  }
  return tally
}
