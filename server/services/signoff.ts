import { Op, UniqueConstraintError } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { Audit, Inspection, Photo } from '../models'
import type { Covering, Site } from '../models'
import type { InspectionCreate } from '../../shared/schemas/inspection'
import type { Actor } from './scope'
import { RecordInvalidError, parseRecord, recordInspection, rulebookInput } from './inspections'

export class SignOffRefusedError extends Error {
  constructor(readonly field: string, message: string) { super(message) }
}

/**
 * Signs off one visit: checks the record, insists on a photo of a fitted tension device, links the
 * photos, and saves the inspection with its findings. The same clientKey twice returns the first.
 */
export async function signOff(db: Sequelize, actor: Actor, site: Site, covering: Covering, body: InspectionCreate) {
  if (body.clientKey) {
    const earlier = await Inspection.findOne({ where: { coveringId: covering.id, clientKey: body.clientKey } })
    if (earlier) return { inspection: earlier, result: undefined, replayed: true }
  }
  // Measured values first: a wrong number is the first thing the installer must put right.
  parseRecord(rulebookInput(site, covering, body.measurements))
  const photos = body.photoIds.length ? await Photo.findAll({ where: { id: { [Op.in]: body.photoIds }, coveringId: covering.id } }) : []
  if (photos.length !== new Set(body.photoIds).size) throw new SignOffRefusedError('photoIds', 'photoIds: a photo listed is not one of this covering\'s photos')
  if (body.measurements.tensionDevice === true && !photos.some(p => p.kind === 'tension_device')) {
    throw new SignOffRefusedError('photoIds', 'photoIds: a covering with a tension device needs a photo of the fitted device before sign-off')
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
  const inspectedAt = body.inspectedAt ? new Date(body.inspectedAt) : new Date()
  if (inspectedAt.getTime() > Date.now() + 5 * 60_000) throw new SignOffRefusedError('inspectedAt', 'inspectedAt: a visit cannot be in the future')
  const save = () => db.transaction(async (transaction) => {
    const { inspection, result } = await recordInspection(db, {
      workspaceId: actor.workspaceId, site, covering, kind: body.correctsId ? 'correction' : body.kind, inspectorId: actor.id,
      inspectedAt, measurements: body.measurements, notes: body.notes, correctsId: body.correctsId, clientKey: body.clientKey,
      photoIds: photos.map(p => p.id), auditId: body.auditId,
    }, transaction)
    return { inspection, result, replayed: false }
  })
  try {
    return await save()
  }
  catch (err) {
    // Two copies of one draft raced: the first one in wins, the second gets it back.
    if (err instanceof UniqueConstraintError && body.clientKey) {
      const first = await Inspection.findOne({ where: { coveringId: covering.id, clientKey: body.clientKey } })
      if (first) return { inspection: first, result: undefined, replayed: true }
    }
    throw err
  }
}

export { RecordInvalidError }
