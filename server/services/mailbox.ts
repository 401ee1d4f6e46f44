import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import type { SentAttachment } from './mail'
import { paged } from './paged'
import { likePattern } from './scope'

// The Mailbox reads the record of what the app sent (sent_mail), one workspace's rows only. Who a message was
// addressed to never decides who may read it: only the workspace that caused it does.

export interface SentMailItem {
  id: number
  kind: 'invite' | 'reset' | 'report' | 'audit_request'
  to: string[]
  subject: string
  status: 'sent' | 'retrying' | 'failed'
  attachmentCount: number
  createdAt: string
}

export interface SentMailMessage extends Omit<SentMailItem, 'attachmentCount'> {
  replyTo: string | null
  from: string
  causedBy: { id: number, name: string } | null
  text: string | null
  error: string | null
  attempts: number
  attachments: Array<{ index: number, fileName: string, sizeBytes: number, contentType: string, url: string }>
}

const sortSql: Record<string, string> = { 'createdAt': 'm.created_at ASC, m.id ASC', '-createdAt': 'm.created_at DESC, m.id DESC' }

export async function listSentMail(db: Sequelize, workspaceId: number, q: { page: number, pageSize: number, sort: string, q?: string }) {
  const where = ['m.workspace_id = :ws']
  const replacements: Record<string, unknown> = { ws: workspaceId }
  if (q.q) {
    where.push(`(m.subject ILIKE :like OR array_to_string(m.recipients, ' ') ILIKE :like)`)
    replacements.like = likePattern(q.q)
  }
  return paged<SentMailItem>(db, `m.id, m.kind, m.recipients AS "to", m.subject, m.status, jsonb_array_length(m.attachments) AS "attachmentCount", m.created_at AS "createdAt"`,
    'sent_mail m', where, sortSql[q.sort] ?? sortSql['-createdAt']!, replacements, q)
}

interface SentMailRow {
  id: number
  kind: SentMailItem['kind']
  to: string[]
  replyTo: string | null
  subject: string
  text: string | null
  status: SentMailItem['status']
  error: string | null
  attempts: number
  createdAt: string
  causedBy: { id: number, name: string } | null
  attachments: SentAttachment[]
}

/** One message of this workspace, or null (another workspace's message is as absent as one that never was). */
export async function getSentMail(db: Sequelize, workspaceId: number, id: number): Promise<SentMailMessage | null> {
  const [row] = await db.query<SentMailRow>(`SELECT m.id, m.kind, m.recipients AS "to", m.reply_to AS "replyTo", m.subject, m.body_text AS text, m.status, m.error,
      m.attempts, m.created_at AS "createdAt", CASE WHEN u.id IS NULL THEN NULL ELSE json_build_object('id', u.id, 'name', u.name) END AS "causedBy", m.attachments
    FROM sent_mail m LEFT JOIN users u ON u.id = m.caused_by AND u.workspace_id = m.workspace_id
    WHERE m.id = :id AND m.workspace_id = :ws`, { type: QueryTypes.SELECT, replacements: { id, ws: workspaceId } })
  if (!row) return null
  return {
    ...row,
    from: process.env.MAIL_FROM ?? 'Tautline <no-reply@tautline.test>',
    attachments: row.attachments.map((a, index) => ({ index, fileName: a.fileName, sizeBytes: a.sizeBytes, contentType: a.contentType,
      url: `/api/dev/mail/${row.id}/attachment?index=${index}` })),
  }
}

/** Where an attachment of this workspace's message is kept, or null. Report PDFs are read back from the dispatch's stored file. */
export async function sentMailAttachment(db: Sequelize, workspaceId: number, id: number, index: number) {
  const [row] = await db.query<{ attachment: SentAttachment | null }>(`SELECT m.attachments -> CAST(:index AS int) AS attachment
    FROM sent_mail m WHERE m.id = :id AND m.workspace_id = :ws`, { type: QueryTypes.SELECT, replacements: { id, ws: workspaceId, index } })
  const attachment = row?.attachment
  if (!attachment?.reportDispatchId) return null
  const [dispatch] = await db.query<{ objectKey: string | null }>(`SELECT object_key AS "objectKey" FROM report_dispatches WHERE id = :id AND workspace_id = :ws`,
    { type: QueryTypes.SELECT, replacements: { id: attachment.reportDispatchId, ws: workspaceId } })
  if (!dispatch?.objectKey) return null
  return { ...attachment, objectKey: dispatch.objectKey }
}
