// Shapes of the audit, remedy, overview and report replies as the server sends them today. Kept in one
// place so they can move to shared/types when the server declares them there.
import type { Verdict } from '#shared/types/register'

export type AuditItemStatus = 'pending' | 'measured' | 'confirmed' | 'not_accessible'

export interface AuditItemRow {
  coveringId: number
  coveringRef: string
  unitId: number
  unitRef: string
  room: string
  productType: string
  control: string
  status: AuditItemStatus
  reason: string | null
  inspectionId: number | null
  verdict: Verdict | null
  lastVerdict: Verdict | null
  updatedAt: string
}

/** Verdict counts of a closed audit; a covering not reached counts as `not_accessible`. */
export type AuditSummary = Partial<Record<Verdict | 'not_accessible', number>>

export interface AuditDetail {
  id: number
  siteId: number
  status: 'open' | 'closed'
  openedAt: string
  openedBy: string | null
  closedAt: string | null
  closedByName: string | null
  summary: AuditSummary | null
  notes: string | null
  progress: { done: number, total: number }
  items: AuditItemRow[]
  resumed?: boolean
}

export interface AuditListRow {
  id: number
  status: 'open' | 'closed'
  openedAt: string
  closedAt: string | null
  closedByName: string | null
  summary: AuditSummary | null
  total: number
  done: number
}

// One shape for both sides: the server's remedy rows are typed from the same file.
export type { RemedyRow } from '#shared/types/audit'

export interface TeamMember { id: number, name: string, role: string }

export interface SiteOverview {
  verdicts: Partial<Record<Verdict | 'unchecked', number>>
  byUnit: Array<{ unitId: number, unitRef: string, unitName: string | null, compliant: number, nonCompliant: number, incomplete: number, other: number }>
  byClause: Array<{ clause: string, source: string, failing: number, missing: number }>
  trend: Array<{ auditId: number, closedAt: string, closedByName: string | null, summary: AuditSummary }>
  fixes: { open: number, overdue: number }
}

/** One closed audit as the trend chart draws it: the date split over two lines, and its stacked counts. */
export interface TrendBar {
  auditId: number
  closedAt: string
  closedByName: string | null
  day: string
  year: string
  segments: Array<{ key: string, label: string, n: number }>
}

export interface ReportDispatch {
  id: number
  siteId: number
  sentBy: { id: number, name: string }
  to: string
  subject: string
  fileName: string
  sizeBytes: number
  status: 'queued' | 'sent' | 'failed'
  attempts: number
  lastError: string | null
  createdAt: string
  sentAt: string | null
  nextAttemptAt: string | null
}
