import type { H3Event } from 'h3'
import type { Sequelize } from 'sequelize'
import { auditCsvStream, writeAuditCsv } from '../services/audit-csv'

/** Streams the audit CSV; rows are written as they are read, never held all at once. */
export function sendAuditCsv(event: H3Event, db: Sequelize, scope: { siteId: number } | { clientId: number }, fileName: string) {
  const stream = auditCsvStream()
  setResponseHeaders(event, {
    'Content-Type': 'text/csv; charset=utf-8',
    'Content-Disposition': `attachment; filename="${fileName.replace(/[^\w.-]/g, '_')}"`,
  })
  writeAuditCsv(db, scope, stream).catch(err => stream.destroy(err as Error))
  return sendStream(event, stream)
}
