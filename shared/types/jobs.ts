// Plain JSON shapes for background jobs (imports, re-checks, exports) and the portfolio.
import type { Verdict } from './register'

export type JobKind = 'import' | 'recheck' | 'export'
export type JobStatus = 'queued' | 'running' | 'succeeded' | 'failed' | 'cancelled'

export interface JobProgress {
  done: number
  /** Null while the total is not known yet. */
  total: number | null
  percent: number
}

export interface JobSummary {
  id: number
  kind: JobKind
  status: JobStatus
  progress: JobProgress
  counts: Record<string, unknown>
  error: string | null
  cancelRequested: boolean
  clientId: number | null
  siteId: number | null
  createdByName: string | null
  createdAt: string
  startedAt: string | null
  finishedAt: string | null
}

/** Created, updated and unchanged records of one kind. */
export interface ChangeCounts { created: number, updated: number, unchanged: number }

export interface ImportCounts {
  rows: number
  goodRows: number
  badRows: number
  /** Problems found; a row can have several. */
  problems: number
  /** False for a dry run, and for a commit that wrote nothing. */
  written: boolean
  sites: ChangeCounts
  units: ChangeCounts
  openings: ChangeCounts
  coverings: ChangeCounts
  inspections: { created: number, unchanged: number }
  remediesRaised: number
}

export interface ImportRowError { row: number, column: string, message: string }

export interface ImportSummary extends JobSummary {
  mode: 'dry_run' | 'commit'
  skipInvalid: boolean
  dryRunId: number | null
  fileName: string
  sizeBytes: number
  sha256: string
  rowCount: number
  badRowCount: number
  errorCount: number
  clientName: string | null
}

export interface ImportDetail extends ImportSummary {
  /** The first problems, by row (see GET /api/imports/:id/errors for all that were kept). */
  rowErrors: ImportRowError[]
  /** How many problems are kept for paging (the first 1,000). */
  rowErrorsKept: number
}

export type RecheckScope = 'site' | 'client' | 'workspace'
export type CheckChange = 'newly_failing' | 'newly_passing' | 'now_incomplete' | 'other' | 'unchanged'

export interface RecheckCounts {
  checked: number
  /** Coverings in place that were never measured: nothing to re-check, and nothing is made up for them. */
  notMeasured: number
  /** Coverings whose register data the rulebook cannot read; none are expected. */
  unreadable: number
  newlyFailing: number
  newlyPassing: number
  nowIncomplete: number
  otherChanges: number
  unchanged: number
  rulesVersions: string[]
}

export interface RecheckSummary extends JobSummary {
  scope: RecheckScope
  scopeId: number | null
  scopeName: string
}

export interface CheckChangeRow {
  coveringId: number
  coveringRef: string
  siteId: number
  siteName: string
  unitRef: string
  room: string
  previousVerdict: Verdict | null
  verdict: Verdict
  change: CheckChange
  rulesVersion: string
  inspectionId: number
  inspectedAt: string
  failedClauses: string[]
  missingFields: string[]
}

export type DueState = 'overdue' | 'due_soon' | 'later' | 'never'

export interface PortfolioUnitRow {
  id: number
  ref: string
  name: string | null
  siteId: number
  siteRef: string
  siteName: string
  coveringCount: number
  compliantCount: number
  nonCompliantCount: number
  incompleteCount: number
  uncheckedCount: number
  overdueCount: number
  /** The earliest re-inspection due date of the unit's coverings (YYYY-MM-DD), or null if none was ever inspected. */
  nextDueOn: string | null
}

export interface PortfolioCoveringRow {
  id: number
  ref: string
  siteId: number
  siteName: string
  unitId: number
  unitRef: string
  room: string
  productType: string
  control: string
  lastVerdict: Verdict | null
  lastInspectedAt: string | null
  dueOn: string | null
  due: DueState
  openRemedies: number
  /** 1 acts first: non-compliant, then overdue, incomplete, never checked, due soon. */
  need: number
}

export interface PortfolioSummary {
  clientName: string | null
  reinspectIntervalMonths: number | null
  coveringCount: number
  compliantCount: number
  nonCompliantCount: number
  incompleteCount: number
  uncheckedCount: number
  overdueCount: number
  dueSoonCount: number
  openRemedies: number
}
