import { createHash } from 'node:crypto'
import { Op, UniqueConstraintError } from 'sequelize'
import type { Sequelize, Transaction } from 'sequelize'
import { Audit, Covering, Inspection, Photo } from '../models'
import type { Site } from '../models'
import { ruleReadCoveringFields } from '../../shared/schemas/inspection'
import type { InspectionCreate } from '../../shared/schemas/inspection'
import type { CoveringRecord } from '../../rules'
import type { Actor } from './scope'
import { RecordInvalidError, SignOffRefusedError, backdateLimitDays, parseRecord, recordInspection, roomOf, rulebookInput } from './inspections'
import { logActivity } from './activity'
import { Refusal } from '../utils/refusal'

/** A clientKey already used for another sign-off (another person's, or other measurements). */
export class ClientKeyConflictError extends Refusal {
  constructor() { super(409, 'clientKey', 'clientKey: this key was already used for a different sign-off of this covering; a new visit needs a new key') }
}

/** JSON with object keys sorted at every level, so equal bodies hash alike whatever order the phone sent them in. */
function canonical(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(canonical)
  if (value && typeof value === 'object') {
    return Object.fromEntries(Object.keys(value).sort().map(k => [k, canonical((value as Record<string, unknown>)[k])]))
  }
  return value
}

export function signOffBodyHash(body: InspectionCreate) {
  const { clientKey: _key, ...rest } = body
  const normal = { ...rest, photoIds: [...new Set(body.photoIds)].sort((a, b) => a - b) }
  return createHash('sha256').update(JSON.stringify(canonical(normal))).digest('hex')
}

/** The first sign-off under this key answers again only to the person who sent it, for the very same body. */
async function replayOf(actor: Actor, covering: Covering, body: InspectionCreate, hash: string) {
  const earlier = await Inspection.findOne({ where: { coveringId: covering.id, clientKey: body.clientKey } })
  if (!earlier) return null
  if (earlier.inspectorId !== actor.id || (earlier.bodySha256 !== null && earlier.bodySha256 !== hash)) throw new ClientKeyConflictError()
  return { inspection: earlier, result: undefined, replayed: true }
}

/**
 * Signs off one visit: checks the record, insists on a decoded photo of a fitted tension device, links the
 * photos, applies the covering's changed rule-read fields and saves the inspection with its findings, in one
 * transaction. The same clientKey twice, from the same person with the same body, returns the first.
 */
export async function signOff(db: Sequelize, actor: Actor, site: Site, covering: Covering, body: InspectionCreate) {
  const hash = signOffBodyHash(body)
  if (body.clientKey) {
    const replay = await replayOf(actor, covering, body, hash)
    if (replay) return replay
  }
  // A removed covering is out of service: its history stays as it was.
  if (covering.status === 'removed') throw new SignOffRefusedError('status', 'status: this covering is recorded as removed; add the covering now in place and inspect that one')
  const changes = body.covering ?? {}
  const asChanged = { ...covering.get({ plain: true }), ...changes } as Covering
  // Measured values first: a wrong number is the first thing the installer must put right. Parsed once, here:
  // the record saved is this one (register data as changed by the visit, the room's flag from the register).
  const record = parseRecord(rulebookInput(site, asChanged, body.measurements, await roomOf(covering)))
  const photos = body.photoIds.length ? await Photo.findAll({ where: { id: { [Op.in]: body.photoIds }, coveringId: covering.id } }) : []
  if (photos.length !== new Set(body.photoIds).size) throw new SignOffRefusedError('photoIds', 'photoIds: a photo listed is not one of this covering\'s photos')
  // Only a photo that decoded to an image (its pixel size recorded) is evidence of anything.
  if (body.measurements.tensionDevice === true && !photos.some(p => p.kind === 'tension_device' && p.widthPx !== null)) {
    throw new SignOffRefusedError('photoIds', 'photoIds: a covering with a tension device needs a photo of the fitted device before sign-off (a readable image; upload it again if it was stored undecoded)')
  }
  if (body.correctsId) {
    const corrected = await Inspection.findOne({ where: { id: body.correctsId, coveringId: covering.id } })
    if (!corrected) throw new SignOffRefusedError('correctsId', 'correctsId: that inspection is not one of this covering\'s')
  }
  if (body.auditId) {
    const audit = await Audit.findOne({ where: { id: body.auditId, siteId: covering.siteId, status: 'open' } })
    if (!audit) throw new SignOffRefusedError('auditId', 'auditId: that audit is not open on this covering\'s site')
    body = { ...body, kind: 'audit' }
  }
  // Undated, the visit is dated as it is recorded; dated, it must fall between the bound and a few minutes ahead.
  const receivedAt = Date.now()
  const inspectedAt = body.inspectedAt ? new Date(body.inspectedAt) : null
  if (inspectedAt && inspectedAt.getTime() > receivedAt + 5 * 60_000) throw new SignOffRefusedError('inspectedAt', 'inspectedAt: a visit cannot be in the future')
  const days = backdateLimitDays()
  if (inspectedAt && inspectedAt.getTime() < receivedAt - days * 86_400_000) {
    throw new SignOffRefusedError('inspectedAt', `inspectedAt: a visit may be dated at most ${days} days before it is sent; record older history through an import`)
  }
  const save = () => db.transaction(async (transaction) => {
    const changed = Object.keys(changes).length ? await applyCoveringChanges(actor, covering, changes, transaction) : covering
    // Should the register have moved since the record was built (a rule-read field, or the room), it is built again
    // from what this transaction sees, so the record saved is the register this visit settles.
    const room = await roomOf(changed, transaction)
    const settled = sameRegister(record, changed, room) ? record : parseRecord(rulebookInput(site, changed, body.measurements, room))
    const { inspection, result } = await recordInspection(db, {
      workspaceId: actor.workspaceId, site, covering: changed, kind: body.correctsId ? 'correction' : body.kind, inspectorId: actor.id,
      inspectedAt, measurements: body.measurements, record: settled, notes: body.notes, correctsId: body.correctsId, clientKey: body.clientKey,
      photoIds: photos.map(p => p.id), countedPhotoIds: photos.filter(p => p.widthPx !== null).map(p => p.id), auditId: body.auditId,
      bodySha256: hash, registerChanges: Object.keys(changes).length ? changes : undefined,
    }, transaction)
    return { inspection, result, replayed: false }
  })
  try {
    return await save()
  }
  catch (err) {
    // Two copies of one draft raced: the first one in wins, the second gets it back (if it is the same request).
    if (err instanceof UniqueConstraintError && body.clientKey) {
      const replay = await replayOf(actor, covering, body, hash)
      if (replay) return replay
    }
    throw err
  }
}

/** Does the record carry the covering's rule-read fields and the room's flag as the register holds them now? */
function sameRegister(record: CoveringRecord, covering: Covering, room: { childrensRoom: boolean | null } | null) {
  return record.childrensRoom === (room?.childrensRoom ?? null)
    && ruleReadCoveringFields.every(k => record[k] === ((covering.get(k) as string | null | undefined) ?? null))
}

/** The covering's rule-read fields as the visit found them, written with the visit (and logged as part of it). */
async function applyCoveringChanges(actor: Actor, covering: Covering, changes: NonNullable<InspectionCreate['covering']>, transaction: Transaction) {
  const row = await Covering.findByPk(covering.id, { transaction, lock: transaction.LOCK.UPDATE })
  if (!row) throw new SignOffRefusedError('covering', 'covering: this covering no longer exists')
  const before = Object.fromEntries(Object.keys(changes).map(k => [k, row.get(k)]))
  await row.update(changes, { transaction })
  await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: 'covering.updated', entity: 'covering', entityId: row.id,
    detail: { before, after: changes, withInspection: true } }, transaction)
  return row
}

export { RecordInvalidError, SignOffRefusedError }
