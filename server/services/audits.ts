import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { Audit, Covering, Inspection } from '../models'
import type { Site } from '../models'
import type { Actor } from './scope'
import { logActivity } from './activity'
import { SignOffRefusedError, recordInspection } from './inspections'
import { Refusal } from '../utils/refusal'

// A site audit walks every covering in place when it opens; each is measured again, confirmed
// unchanged, or marked not accessible with a reason. Its state lives here, so any device resumes it.

export class AuditRefusedError extends Refusal {
  constructor(field: string, message: string, statusCode = 400) { super(statusCode, field, message) }
}

export async function openAudit(db: Sequelize, actor: Actor, site: Site) {
  const open = await Audit.findOne({ where: { siteId: site.id, status: 'open' } })
  if (open) return { audit: open, resumed: true }
  const audit = await db.transaction(async (transaction) => {
    const created = await Audit.create({ workspaceId: site.workspaceId, siteId: site.id, openedBy: actor.id }, { transaction })
    await db.query(`INSERT INTO audit_items (audit_id, covering_id) SELECT :audit, id FROM coverings WHERE site_id = :site AND status = 'in_place'`,
      { transaction, replacements: { audit: created.id, site: site.id } })
    await logActivity({ workspaceId: site.workspaceId, userId: actor.id, action: 'audit.opened', entity: 'site', entityId: site.id, detail: { auditId: created.id } }, transaction)
    return created
  })
  return { audit, resumed: false }
}

export interface AuditItemRow {
  coveringId: number
  coveringRef: string
  unitId: number
  unitRef: string
  room: string
  productType: string
  control: string
  status: 'pending' | 'measured' | 'confirmed' | 'not_accessible'
  reason: string | null
  inspectionId: number | null
  verdict: string | null
  lastVerdict: string | null
  updatedAt: string
}

export async function auditDetail(db: Sequelize, audit: Audit) {
  const items = await db.query<AuditItemRow>(`SELECT ai.covering_id AS "coveringId", c.ref AS "coveringRef", u.id AS "unitId", u.ref AS "unitRef",
      o.room, c.product_type AS "productType", c.control, ai.status, ai.reason, ai.inspection_id AS "inspectionId", i.verdict,
      c.last_verdict AS "lastVerdict", ai.updated_at AS "updatedAt"
    FROM audit_items ai JOIN coverings c ON c.id = ai.covering_id JOIN openings o ON o.id = c.opening_id JOIN units u ON u.id = o.unit_id
    LEFT JOIN inspections i ON i.id = ai.inspection_id
    WHERE ai.audit_id = :audit ORDER BY u.ref, o.ref, c.ref`, { type: QueryTypes.SELECT, replacements: { audit: audit.id } })
  const done = items.filter(i => i.status !== 'pending').length
  const [opener] = await db.query<{ name: string }>('SELECT name FROM users WHERE id = :id', { type: QueryTypes.SELECT, replacements: { id: audit.openedBy } })
  return {
    id: audit.id, siteId: audit.siteId, status: audit.status, openedAt: audit.openedAt, openedBy: opener?.name ?? null,
    closedAt: audit.closedAt, closedByName: audit.closedByName, summary: audit.summary, notes: audit.notes,
    progress: { done, total: items.length }, items,
  }
}

/** Marks one covering of an open audit as confirmed unchanged (a new audit inspection of the same measurements) or not accessible. */
export async function markAuditItem(db: Sequelize, actor: Actor, audit: Audit, site: Site, body: { coveringId: number, status: 'confirmed' | 'not_accessible', reason?: string | null }) {
  if (audit.status !== 'open') throw new AuditRefusedError('auditId', 'This audit is closed; open a new one to record more', 409)
  const [item] = await db.query<{ status: string }>('SELECT status FROM audit_items WHERE audit_id = :a AND covering_id = :c',
    { type: QueryTypes.SELECT, replacements: { a: audit.id, c: body.coveringId } })
  if (!item) throw new AuditRefusedError('coveringId', 'coveringId: that covering is not part of this audit', 404)
  if (body.status === 'not_accessible') {
    if (!body.reason) throw new AuditRefusedError('reason', 'reason: say why the covering could not be reached')
    await db.transaction(async (transaction) => {
      await db.query(`UPDATE audit_items SET status = 'not_accessible', reason = :reason, inspection_id = NULL, updated_by = :by, updated_at = now()
        WHERE audit_id = :a AND covering_id = :c`, { transaction, replacements: { reason: body.reason, by: actor.id, a: audit.id, c: body.coveringId } })
      await logActivity({ workspaceId: audit.workspaceId, userId: actor.id, action: 'audit.not_accessible', entity: 'covering', entityId: body.coveringId, detail: { auditId: audit.id, reason: body.reason } }, transaction)
    })
    return
  }
  const covering = await Covering.findByPk(body.coveringId)
  const previous = covering?.lastInspectionId ? await Inspection.findByPk(covering.lastInspectionId) : null
  if (!covering || !previous) throw new AuditRefusedError('coveringId', 'coveringId: this covering has never been measured, so there is nothing to confirm; measure it instead')
  await db.transaction(async (transaction) => {
    await recordInspection(db, {
      workspaceId: audit.workspaceId, site, covering, kind: 'audit', inspectorId: actor.id, inspectedAt: null,
      measurements: previous.record, notes: `Confirmed unchanged at audit against inspection #${previous.id}`, auditId: audit.id,
      // Who measured, and when, stays with the measurements: a confirmation points at the visit that took them.
      confirmsId: previous.confirmsId ?? previous.id,
    }, transaction)
    await db.query(`UPDATE audit_items SET status = 'confirmed' WHERE audit_id = :a AND covering_id = :c`, { transaction, replacements: { a: audit.id, c: body.coveringId } })
  }).catch((err) => {
    // A visit recorded meanwhile, dated later than now, cannot be confirmed from behind.
    if (err instanceof SignOffRefusedError) throw new AuditRefusedError('coveringId', `coveringId: ${err.message}`, 409)
    throw err
  })
}

export async function closeAudit(db: Sequelize, actor: Actor, audit: Audit, notes: string | null) {
  if (audit.status !== 'open') throw new AuditRefusedError('auditId', 'This audit is already closed', 409)
  const [counts] = await db.query<{ pending: number, total: number }>(
    `SELECT count(*) FILTER (WHERE status = 'pending')::int AS pending, count(*)::int AS total FROM audit_items WHERE audit_id = :a`,
    { type: QueryTypes.SELECT, replacements: { a: audit.id } })
  if (counts && counts.pending > 0) {
    throw new AuditRefusedError('items', `items: ${counts.pending} of ${counts.total} coverings are still to be measured, confirmed or marked not accessible`)
  }
  const verdicts = await db.query<{ verdict: string, n: number }>(`SELECT coalesce(i.verdict, 'not_accessible') AS verdict, count(*)::int AS n
    FROM audit_items ai LEFT JOIN inspections i ON i.id = ai.inspection_id
    WHERE ai.audit_id = :a GROUP BY 1`, { type: QueryTypes.SELECT, replacements: { a: audit.id } })
  const summary = Object.fromEntries(verdicts.map(v => [v.verdict, v.n]))
  await db.transaction(async (transaction) => {
    await audit.update({ status: 'closed', closedBy: actor.id, closedByName: actor.name ?? null, closedAt: new Date(), summary, notes }, { transaction })
    await logActivity({ workspaceId: audit.workspaceId, userId: actor.id, action: 'audit.closed', entity: 'site', entityId: audit.siteId, detail: { auditId: audit.id, summary } }, transaction)
  })
  return audit
}
