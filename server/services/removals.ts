import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { Covering, Photo } from '../models'
import type { CoveringRemovalCreate } from '../../shared/schemas/removal'
import type { Actor } from './scope'
import { logActivity } from './activity'
import { Refusal } from '../utils/refusal'

// A removal takes a covering out of service for good: who, when, why, optionally a photo and the covering that
// replaced it. The covering stays in the site's history, CSV and reports; its open remedies close with the removal.

export class RemovalRefusedError extends Refusal {
  constructor(field: string, message: string, statusCode = 400) { super(statusCode, field, message) }
}

export async function removeCovering(db: Sequelize, actor: Actor, covering: Covering, body: CoveringRemovalCreate) {
  if (body.photoId) {
    const photo = await Photo.findOne({ where: { id: body.photoId, coveringId: covering.id } })
    if (!photo) throw new RemovalRefusedError('photoId', 'photoId: that photo is not one of this covering\'s photos')
    if (photo.widthPx === null) throw new RemovalRefusedError('photoId', 'photoId: that photo was stored without being read as an image; upload it again')
  }
  if (body.replacedById) {
    const replacement = await Covering.findOne({ where: { id: body.replacedById, siteId: covering.siteId, status: 'in_place' } })
    if (!replacement || replacement.id === covering.id) {
      throw new RemovalRefusedError('replacedById', 'replacedById: name a covering in place on the same site (add the new covering first)')
    }
  }
  return db.transaction(async (transaction) => {
    const row = await Covering.findByPk(covering.id, { transaction, lock: transaction.LOCK.UPDATE })
    if (!row || row.status === 'removed') throw new RemovalRefusedError('status', 'status: this covering is already removed', 409)
    const [removal] = await db.query<{ id: number, removedAt: Date }>(`INSERT INTO covering_removals (workspace_id, covering_id, removed_by, reason, photo_id, replaced_by)
      VALUES (:ws, :covering, :by, :reason, :photo, :replacedBy) RETURNING id, removed_at AS "removedAt"`,
    { type: QueryTypes.SELECT, transaction, replacements: { ws: actor.workspaceId, covering: row.id, by: actor.id, reason: body.reason, photo: body.photoId, replacedBy: body.replacedById } })
    await row.update({ status: 'removed' }, { transaction })
    const closed = await db.query<{ id: number }>(`UPDATE fixes SET status = 'closed', closed_by_removal_id = :removal, closed_at = now(), updated_at = now()
      WHERE covering_id = :covering AND status = 'open' RETURNING id`, { type: QueryTypes.SELECT, transaction, replacements: { removal: removal!.id, covering: row.id } })
    // An open audit no longer waits for a covering that is gone.
    await db.query(`DELETE FROM audit_items ai USING audits a WHERE a.id = ai.audit_id AND a.status = 'open' AND ai.covering_id = :covering AND ai.status = 'pending'`,
      { transaction, replacements: { covering: row.id } })
    await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: 'covering.removed', entity: 'covering', entityId: row.id,
      detail: { removalId: removal!.id, reason: body.reason, photoId: body.photoId, replacedById: body.replacedById, closedRemedies: closed.map(c => c.id) } }, transaction)
    for (const fix of closed) {
      await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: 'fix.closed', entity: 'fix', entityId: fix.id, detail: { removalId: removal!.id } }, transaction)
    }
    return { id: removal!.id, coveringId: row.id, removedAt: removal!.removedAt, reason: body.reason, photoId: body.photoId, replacedById: body.replacedById, closedRemedies: closed.length }
  })
}
