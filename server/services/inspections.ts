import type { Sequelize, Transaction } from 'sequelize'
import { buildRecord, checkRecord, parseCoveringRecord } from '../../rules'
import type { CheckResult, CoveringRecord } from '../../rules'
import { Covering, Finding, Inspection, Opening } from '../models'
import type { Site } from '../models'
import { logActivity } from './activity'
import { applyInspectionToRemedies } from './fixes'
import { Refusal } from '../utils/refusal'

export type InspectionKind = 'fitting' | 'audit' | 'import' | 'correction'

/**
 * The rulebook record for a covering: register data (site, covering, the room's child's-room flag) plus the
 * measurements taken on this visit, built by the rulebook's buildRecord as the fitting form and the import build it.
 */
export function rulebookInput(site: Pick<Site, 'jurisdiction' | 'premises'>, covering: Pick<Covering, 'ref' | 'productType' | 'control' | 'madeTo' | 'manufacturedOn' | 'installedOn'>, measurements: Record<string, unknown>, opening: { childrensRoom: boolean | null } | null) {
  return buildRecord({
    ref: covering.ref, jurisdiction: site.jurisdiction, premises: site.premises, productType: covering.productType, control: covering.control,
    madeTo: covering.madeTo, manufacturedOn: covering.manufacturedOn, installedOn: covering.installedOn, childrensRoom: opening?.childrensRoom ?? null,
  }, measurements)
}

/** The room's child's-room flag as the register holds it, for the covering's record. */
export async function roomOf(covering: Pick<Covering, 'openingId'>, transaction?: Transaction) {
  return Opening.findByPk(covering.openingId, { attributes: ['childrensRoom'], transaction })
}

export class SignOffRefusedError extends Refusal {
  constructor(field: string, message: string) { super(400, field, message) }
}

/** How many days before it reaches the server a visit may be dated (INSPECTION_BACKDATE_DAYS, default 14). */
export function backdateLimitDays() {
  const raw = Number.parseInt(process.env.INSPECTION_BACKDATE_DAYS ?? '', 10)
  return Number.isFinite(raw) && raw >= 0 && raw <= 3650 ? raw : 14
}

/** Measurements the rulebook cannot read: every field at fault, each named under the body's key (`measurements.`). */
export class RecordInvalidError extends Refusal {
  constructor(message: string, fields: Record<string, string>) { super(400, Object.keys(fields)[0] ?? null, message, fields) }
}

/** Builds the record the rulebook reads; fields at fault are named as the request sent them, under `under`. */
export function parseRecord(input: unknown, under = 'measurements'): CoveringRecord {
  const parsed = parseCoveringRecord(input)
  if (parsed.success) return parsed.data
  const fields: Record<string, string> = {}
  for (const issue of parsed.error.issues) fields[`${under}.${issue.path.join('.') || '_'}`] ??= issue.message
  const [first] = Object.entries(fields)
  throw new RecordInvalidError(first ? `${first[0]}: ${first[1]}` : `${under}: the record is not valid`, fields)
}

function asText(v: unknown): string | null {
  return v === null || v === undefined ? null : String(v)
}

/**
 * Saves one inspection with every finding, and points the covering at it, in one transaction.
 * Inspections and findings are evidence: they are only ever inserted.
 */
export async function recordInspection(db: Sequelize, args: {
  workspaceId: number
  site: Site
  covering: Covering
  kind: InspectionKind
  inspectorId: number | null
  /** When the visit happened; null dates it now, as it is recorded (inside the covering's lock, so in order). */
  inspectedAt: Date | null
  measurements: Record<string, unknown>
  /** The record already built and parsed from these measurements (sign-off parses once); built here when absent. */
  record?: CoveringRecord
  notes?: string | null
  correctsId?: number | null
  clientKey?: string | null
  photoIds?: number[]
  /** The linked photos that count as evidence (decoded, pixel size recorded); defaults to none. */
  countedPhotoIds?: number[]
  auditId?: number | null
  bodySha256?: string | null
  /** For an audit confirmation: the inspection whose measurements are confirmed unchanged. */
  confirmsId?: number | null
  /** Register fields the visit changed on the covering, for the activity log. */
  registerChanges?: Record<string, unknown>
}, outer?: Transaction): Promise<{ inspection: Inspection, result: CheckResult }> {
  const record = args.record ?? parseRecord(rulebookInput(args.site, args.covering, args.measurements, await roomOf(args.covering, outer)))
  const work = async (transaction: Transaction) => {
    // One sign-off at a time per covering: two at once would both see no open remedy for a clause and both
    // raise one, or both decide which inspection is the latest from what they read before either committed.
    const current = await Covering.findByPk(args.covering.id, { attributes: ['id', 'lastInspectedAt'], transaction, lock: transaction.LOCK.UPDATE })
    // A visit is never dated before the covering's latest inspection: history is not rewritten from behind.
    const inspectedAt = args.inspectedAt ?? new Date()
    if (current?.lastInspectedAt && inspectedAt < current.lastInspectedAt) {
      throw new SignOffRefusedError('inspectedAt', `inspectedAt: this covering was last inspected at ${current.lastInspectedAt.toISOString()}; a visit cannot be dated before that`)
    }
    const result = checkRecord(record, { today: inspectedAt.toISOString().slice(0, 10) })
    const inspection = await Inspection.create({
      workspaceId: args.workspaceId, siteId: args.site.id, coveringId: args.covering.id, kind: args.kind,
      inspectedAt, inspectorId: args.inspectorId, record: record as unknown as Record<string, unknown>,
      rulesVersion: result.rulesVersion, verdict: result.verdict, notes: args.notes ?? null, correctsId: args.correctsId ?? null, clientKey: args.clientKey ?? null, auditId: args.auditId ?? null,
      bodySha256: args.bodySha256 ?? null, confirmsId: args.confirmsId ?? null,
    }, { transaction })
    await Finding.bulkCreate(result.findings.map(f => ({
      inspectionId: inspection.id, clause: f.clause, verdict: f.verdict, measured: asText(f.measured), limitValue: asText(f.limit),
      unit: f.unit ?? null, field: f.field ?? null, source: f.source, basis: f.basis, message: f.message, fix: f.fix ?? null,
    })), { transaction })
    const photoIds = args.photoIds ?? []
    if (photoIds.length) {
      await db.query(`INSERT INTO inspection_photos (inspection_id, photo_id) SELECT :inspection, unnest(ARRAY[:photos]::int[])`,
        { transaction, replacements: { inspection: inspection.id, photos: photoIds } })
    }
    if (args.auditId) {
      await db.query(`UPDATE audit_items SET status = 'measured', inspection_id = :inspection, reason = NULL, updated_by = :by, updated_at = now()
        WHERE audit_id = :audit AND covering_id = :covering`,
      { transaction, replacements: { inspection: inspection.id, by: args.inspectorId, audit: args.auditId, covering: args.covering.id } })
    }
    await applyInspectionToRemedies(db, { inspection, result, site: args.site, childrensRoom: record.childrensRoom === true,
      photoCount: (args.countedPhotoIds ?? []).length, actorId: args.inspectorId }, transaction)
    // The newest visit is the covering's current verdict, and it settles any register edit made since the last one.
    await Covering.update({ lastInspectionId: inspection.id, lastVerdict: result.verdict, lastInspectedAt: inspectedAt,
      changedSinceInspection: false, changedFields: [], changedAt: null }, { where: { id: args.covering.id }, transaction })
    await logActivity({ workspaceId: args.workspaceId, userId: args.inspectorId, action: `inspection.${args.kind}`, entity: 'covering', entityId: args.covering.id,
      detail: { inspectionId: inspection.id, verdict: result.verdict, rulesVersion: result.rulesVersion, ...(args.registerChanges ? { registerChanges: args.registerChanges } : {}) } }, transaction)
    return { inspection, result }
  }
  return outer ? work(outer) : db.transaction(work)
}
