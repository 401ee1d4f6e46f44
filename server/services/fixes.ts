import { QueryTypes } from 'sequelize'
import type { Sequelize, Transaction } from 'sequelize'
import type { CheckResult } from '../../rules'
import { Fix } from '../models'
import type { Inspection, Site } from '../models'
import { paged } from './paged'
import { likePattern, orderBy, siteScopeSql } from './scope'
import type { Actor } from './scope'
import type { RemedyRow } from '../../shared/types/audit'
import { logActivity } from './activity'

// A remedy is the fix one failing clause calls for. It opens when an inspection fails the clause
// and closes only when a later inspection of the same covering passes it and carries a decoded photo
// (photoCount counts only photos whose pixel size was recorded), or when the covering is removed.

const labelFields = new Set(['warningLabel', 'swingTag', 'installerLabel', 'manufacturerLabel'])
const childPremises = new Set(['childcare', 'school'])
/** Days to remedy, by priority: 1 is a cord within a young child's reach. */
export const daysToRemedy: Record<number, number> = { 1: 2, 2: 7, 3: 14, 4: 28 }

/**
 * Priority from the hazard: a cord or loop failure where young children sleep or play comes first,
 * then any other cord failure, then labelling.
 */
export function remedyPriority(field: string | null, premises: string, childrensRoom: boolean) {
  if (field && labelFields.has(field)) return 3
  return childPremises.has(premises) || childrensRoom ? 1 : 2
}

function addDays(iso: string, days: number) {
  const d = new Date(`${iso}T00:00:00Z`)
  d.setUTCDate(d.getUTCDate() + days)
  return d.toISOString().slice(0, 10)
}

export async function applyInspectionToRemedies(db: Sequelize, args: {
  inspection: Inspection
  result: CheckResult
  site: Site
  childrensRoom: boolean
  photoCount: number
  actorId: number | null
}, transaction: Transaction) {
  const { inspection, result, site } = args
  const open = await Fix.findAll({ where: { coveringId: inspection.coveringId, status: 'open' }, transaction })
  // A remedy closes only through a visit later than the one that raised it.
  const raisedRows = open.length
    ? await db.query<{ id: number, at: Date }>(`SELECT f.id, i.inspected_at AS at FROM fixes f JOIN inspections i ON i.id = f.raised_by_inspection_id WHERE f.id IN (:ids)`,
        { type: QueryTypes.SELECT, replacements: { ids: open.map(f => f.id) }, transaction })
    : []
  const raisedAt = new Map(raisedRows.map(r => [r.id, new Date(r.at)]))
  const openByClause = new Map(open.map(f => [f.clause, f]))
  const today = inspection.inspectedAt.toISOString().slice(0, 10)
  const raised: number[] = []
  const closed: number[] = []
  for (const f of result.findings) {
    if (f.verdict === 'fail' && !openByClause.has(f.clause)) {
      const priority = remedyPriority(f.field, site.premises, args.childrensRoom)
      const fix = await Fix.create({
        workspaceId: inspection.workspaceId, siteId: inspection.siteId, coveringId: inspection.coveringId, clause: f.clause,
        raisedByInspectionId: inspection.id, message: f.message, fix: f.fix ?? null, source: f.source, priority,
        dueOn: addDays(today, daysToRemedy[priority]!),
      }, { transaction })
      raised.push(fix.id)
    }
    const existing = openByClause.get(f.clause)
    const later = existing && inspection.inspectedAt > (raisedAt.get(existing.id) ?? inspection.inspectedAt)
    if (existing && later && (f.verdict === 'pass' || f.verdict === 'not_applicable') && args.photoCount > 0) {
      await existing.update({ status: 'closed', closedByInspectionId: inspection.id, closedAt: new Date() }, { transaction })
      closed.push(existing.id)
    }
  }
  for (const id of raised) {
    await logActivity({ workspaceId: inspection.workspaceId, userId: args.actorId, action: 'fix.raised', entity: 'fix', entityId: id, detail: { inspectionId: inspection.id } }, transaction)
  }
  for (const id of closed) {
    await logActivity({ workspaceId: inspection.workspaceId, userId: args.actorId, action: 'fix.closed', entity: 'fix', entityId: id, detail: { inspectionId: inspection.id } }, transaction)
  }
  return { raised, closed }
}

export type FixRow = RemedyRow

export const fixSelect = `f.id, f.site_id AS "siteId", s.name AS "siteName", f.covering_id AS "coveringId", c.ref AS "coveringRef",
  u.ref AS "unitRef", o.room, f.clause, f.message, f.fix, f.source, f.priority, f.status, f.assignee_id AS "assigneeId",
  a.name AS "assigneeName", to_char(f.due_on, 'YYYY-MM-DD') AS "dueOn", (f.status = 'open' AND f.due_on < current_date) AS overdue,
  f.closed_at AS "closedAt", f.closed_by_inspection_id AS "closedByInspectionId",
  (SELECT json_build_object('reason', r.reason, 'removedAt', r.removed_at) FROM covering_removals r WHERE r.id = f.closed_by_removal_id) AS "closedByRemoval",
  f.created_at AS "createdAt"`
export const fixFrom = `fixes f JOIN sites s ON s.id = f.site_id JOIN coverings c ON c.id = f.covering_id
  JOIN openings o ON o.id = c.opening_id JOIN units u ON u.id = o.unit_id LEFT JOIN users a ON a.id = f.assignee_id`

export async function openFixCounts(db: Sequelize, siteId: number) {
  const [row] = await db.query<{ open: number, overdue: number }>(
    `SELECT count(*) FILTER (WHERE status = 'open')::int AS open,
            count(*) FILTER (WHERE status = 'open' AND due_on < current_date)::int AS overdue
     FROM fixes WHERE site_id = :siteId`, { type: QueryTypes.SELECT, replacements: { siteId } })
  return row ?? { open: 0, overdue: 0 }
}

export interface FixQuery {
  page: number
  pageSize: number
  sort: string
  q?: string
  siteId?: number
  coveringId?: number
  assigneeId?: number
  status: 'open' | 'closed' | 'all'
  overdue?: 'true' | 'false'
  priority?: number
}

export async function listFixes(db: Sequelize, actor: Actor, q: FixQuery) {
  const scope = siteScopeSql(actor)
  const where = [scope.sql]
  const replacements: Record<string, unknown> = { ...scope.replacements }
  if (q.status !== 'all') { where.push('f.status = :status'); replacements.status = q.status }
  if (q.siteId) { where.push('f.site_id = :siteId'); replacements.siteId = q.siteId }
  if (q.coveringId) { where.push('f.covering_id = :coveringId'); replacements.coveringId = q.coveringId }
  if (q.assigneeId) { where.push('f.assignee_id = :assigneeId'); replacements.assigneeId = q.assigneeId }
  if (q.priority) { where.push('f.priority = :priority'); replacements.priority = q.priority }
  if (q.overdue === 'true') where.push(`f.status = 'open' AND f.due_on < current_date`)
  if (q.overdue === 'false') where.push(`NOT (f.status = 'open' AND f.due_on < current_date)`)
  if (q.q) { where.push('(c.ref ILIKE :q OR f.clause ILIKE :q OR s.name ILIKE :q OR o.room ILIKE :q)'); replacements.q = likePattern(q.q) }
  const order = orderBy(q.sort, { dueOn: 'f.due_on', priority: 'f.priority', createdAt: 'f.created_at', clause: 'f.clause' }, 'f.id')
  return paged<FixRow>(db, fixSelect, fixFrom, where, order, replacements, q)
}

export async function getFix(db: Sequelize, actor: Actor, id: number) {
  const scope = siteScopeSql(actor)
  const [row] = await db.query<FixRow>(`SELECT ${fixSelect} FROM ${fixFrom} WHERE f.id = :id AND ${scope.sql}`,
    { type: QueryTypes.SELECT, replacements: { ...scope.replacements, id } })
  return row ?? null
}

/** Assignee and due date are the only things a person changes on a remedy; closing takes an inspection. */
export async function updateFix(db: Sequelize, actor: Actor, fix: Fix, changes: { assigneeId?: number | null, dueOn?: string }) {
  if (changes.assigneeId) {
    const [staff] = await db.query<{ id: number }>(`SELECT id FROM users WHERE id = :id AND workspace_id = :ws AND role <> 'manager' AND active`,
      { type: QueryTypes.SELECT, replacements: { id: changes.assigneeId, ws: actor.workspaceId } })
    if (!staff) throw Object.assign(new Error('assigneeId: assign the remedy to an active member of your team'), { field: 'assigneeId', statusCode: 400 })
  }
  if (fix.status === 'closed') throw Object.assign(new Error('This remedy is closed; a later failure opens a new one'), { field: 'status', statusCode: 409 })
  const before = { assigneeId: fix.assigneeId, dueOn: fix.dueOn }
  await db.transaction(async (transaction) => {
    await fix.update(changes, { transaction })
    await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: 'fix.updated', entity: 'fix', entityId: fix.id, detail: { before, after: changes } }, transaction)
  })
}
