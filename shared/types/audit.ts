// A remedy (a row of the `fixes` table) as the API returns it. Dates are ISO strings.
export interface RemedyRow {
  id: number
  siteId: number
  siteName: string
  coveringId: number
  coveringRef: string
  unitRef: string
  room: string
  clause: string
  message: string
  fix: string | null
  source: string
  priority: number
  status: 'open' | 'closed'
  assigneeId: number | null
  assigneeName: string | null
  dueOn: string
  overdue: boolean
  closedAt: string | null
  closedByInspectionId: number | null
  /** Set when the remedy closed because the covering was removed (a recorded removal, with its reason). */
  closedByRemoval: { reason: string, removedAt: string } | null
  createdAt: string
}
