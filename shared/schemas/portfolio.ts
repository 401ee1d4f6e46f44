import { z } from 'zod'
import { idValue, listQuerySchema, multilineText } from './common'
import { verdicts } from './register'

// The property manager's portfolio: units and coverings filtered by site, verdict and due date,
// and the request for an audit.
// Ids are whole numbers (or their digits in a query string), never coerced from true or ''.
const idOf = idValue

/** Coverings due within this many days count as due soon. */
export const DUE_SOON_DAYS = 30
export const dueStates = ['overdue', 'due_soon', 'later', 'never'] as const

const filters = {
  siteId: idOf('siteId').optional(),
  clientId: idOf('clientId').optional(),
  verdict: z.enum(verdicts, { error: `verdict must be one of ${verdicts.join(', ')}` }).optional(),
  due: z.enum(dueStates, { error: `due must be one of ${dueStates.join(', ')}` }).optional(),
}
export const portfolioSummaryQuery = z.object({ siteId: filters.siteId, clientId: filters.clientId })
export const portfolioUnitQuery = listQuerySchema(['ref', 'site', 'failing', 'due'], '-failing').extend(filters)
export const portfolioCoveringQuery = listQuerySchema(['need', 'due', 'ref'], 'need').extend({
  ...filters,
  unitId: idOf('unitId').optional(),
  /** Only coverings that need something: non-compliant, overdue, incomplete, never checked or due soon. */
  attention: z.enum(['true', 'false'], { error: 'attention must be true or false' }).optional(),
})

export const auditRequestSchema = z.object({
  siteIds: z.array(idOf('siteIds'), { error: 'siteIds must be a list of site ids' }).min(1, 'siteIds: choose at least one site').max(50, 'siteIds: at most 50 sites'),
  unitIds: z.array(idOf('unitIds'), { error: 'unitIds must be a list of unit ids' }).max(200, 'unitIds: at most 200 units').default([]),
  preferredFrom: z.iso.date({ error: 'preferredFrom is a date, YYYY-MM-DD' }).nullish().transform(v => v ?? null),
  message: multilineText(2000, 'message'),
})
export type AuditRequest = z.infer<typeof auditRequestSchema>
