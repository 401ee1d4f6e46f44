// Words for background jobs, re-check changes and re-inspection due dates, the same on every screen.
import type { CheckChange, DueState, JobStatus, PortfolioUnitRow } from '#shared/types/jobs'
import { formatDate } from './format'

export const jobStatusLabels: Record<JobStatus, string> = {
  queued: 'Waiting to start',
  running: 'Working',
  succeeded: 'Finished',
  failed: 'Stopped',
  cancelled: 'Cancelled',
}

export const changeLabels: Record<CheckChange, string> = {
  newly_failing: 'Now non-compliant',
  newly_passing: 'Now compliant',
  now_incomplete: 'Now incomplete',
  other: 'Other change',
  unchanged: 'Unchanged',
}

export const dueLabels: Record<DueState, string> = {
  overdue: 'Re-inspection overdue',
  due_soon: 'Due within 30 days',
  later: 'Not due yet',
  never: 'Never inspected',
}

export const importModeLabels = { dry_run: 'Check only', commit: 'Import' } as const

/** "3 rows" / "1 row": a count with its noun. */
export function counted(n: number, noun: string, plural = `${noun}s`) {
  return `${n.toLocaleString('en-GB')} ${n === 1 ? noun : plural}`
}

/** When a unit is next due for re-inspection, in words; `short` for a table cell. */
export function unitDueWords(u: PortfolioUnitRow, short = false) {
  if (!u.nextDueOn) return u.coveringCount ? 'Never inspected' : 'No coverings'
  if (u.nextDueOn < new Date().toISOString().slice(0, 10)) return `${short ? 'Overdue' : 'Re-inspection overdue'} since ${formatDate(u.nextDueOn)}`
  return short ? formatDate(u.nextDueOn) : `Next re-inspection ${formatDate(u.nextDueOn)}`
}
