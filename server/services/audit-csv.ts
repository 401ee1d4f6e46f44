import { once } from 'node:events'
import { stringify } from 'csv-stringify'
import type { Stringifier } from 'csv-stringify'
import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'

// The audit CSV: one row per covering (removed ones too, with who removed them and why), streamed in batches so
// memory stays flat however large the portfolio. Who measured and who only confirmed are separate columns, and
// the latest audit's outcome per covering is stated. The README documents every column.

export const auditCsvColumns = [
  ['site_ref', 'site reference'], ['site_name', 'site name'], ['client', 'client (landlord or agency)'], ['jurisdiction', 'rule set jurisdiction: AU, CA, US or EU'],
  ['unit_ref', 'unit reference'], ['unit_name', 'unit name'], ['room', 'room'], ['opening_ref', 'window or door reference'], ['covering_ref', 'covering reference'],
  ['status', 'in_place or removed'], ['removed_on', 'date the removal was recorded (YYYY-MM-DD, UTC)'], ['removed_by', 'who recorded the removal'],
  ['removal_reason', 'why it was removed'], ['replaced_by', 'reference of the covering that replaced it'],
  ['product_type', 'product type'], ['control', 'control type'], ['made_to', 'stock or custom'],
  ['width_mm', 'covering width (mm)'], ['drop_mm', 'covering drop (mm)'],
  ['head_height_mm', 'top of the headrail above the floor (mm)'], ['lowest_cord_point_mm', 'lowest point any cord or chain reaches above the floor (mm)'],
  ['loop_pull_out_mm', 'longest loop that can be pulled out, laid flat (mm)'], ['loop_perimeter_mm', 'loop perimeter (mm)'],
  ['free_cord_length_mm', 'longest reachable free cord (mm)'], ['tension_device', 'tension device fitted (yes/no)'],
  ['tension_device_height_mm', 'tension device height above the floor (mm)'], ['tension_device_hold_n', 'force the tension device held for 10 s (N)'],
  ['cleat_height_mm', 'cleat height above the floor (mm)'],
  ['verdict', 'overall verdict of the last inspection: compliant, non_compliant, incomplete, not_applicable, or unchecked'],
  ['failed_clauses', 'failed clauses of the last inspection, each as clause id [source]'],
  ['last_inspected_on', 'date of the last inspection (YYYY-MM-DD, UTC)'], ['last_inspection_kind', 'fitting, audit, import or correction'],
  ['measured_by', 'who took the measurements the verdict rests on'], ['measured_on', 'date those measurements were taken (YYYY-MM-DD, UTC)'],
  ['confirmed_by', 'who confirmed them unchanged at an audit, if the last inspection was a confirmation'], ['confirmed_on', 'date of that confirmation (YYYY-MM-DD, UTC)'],
  ['changed_since_inspection', 'yes if a register detail the rules read changed after the last inspection (inspect again)'],
  ['audit_id', 'the latest audit of the site that listed the covering'],
  ['audit_outcome', 'its outcome for the covering: measured, confirmed_unchanged, not_accessible, or pending while the audit is open'],
  ['audit_note', 'the reason a covering was not accessible, or the audit inspection\'s note'],
  ['photo_count', 'photos held for the covering'], ['rules_version', 'rule-set version the last inspection was checked under'],
] as const

/** Spreadsheet formula guard: a cell starting with = + - @ tab or CR is prefixed with an apostrophe. */
export function neutraliseCell(value: string) {
  return /^[=+\-@\t\r]/.test(value) ? `'${value}` : value
}

const recordField = (name: string) => `i.record->>'${name}'`
const BATCH = 1000

interface Row { id: number, [k: string]: unknown }

export async function writeAuditCsv(db: Sequelize, scope: { siteId: number } | { clientId: number }, out: Stringifier) {
  const filter = 'siteId' in scope ? 'c.site_id = :scopeId' : 's.client_id = :scopeId'
  const scopeId = 'siteId' in scope ? scope.siteId : scope.clientId
  let after = 0
  for (;;) {
    const rows = await db.query<Row>(`SELECT c.id, s.ref AS site_ref, s.name AS site_name, cl.name AS client, s.jurisdiction,
        u.ref AS unit_ref, u.name AS unit_name, o.room, o.ref AS opening_ref, c.ref AS covering_ref, c.product_type, c.control, c.made_to,
        c.width_mm, c.drop_mm, ${recordField('headHeightMm')} AS head_height_mm, ${recordField('lowestCordPointMm')} AS lowest_cord_point_mm,
        ${recordField('loopPullOutMm')} AS loop_pull_out_mm, ${recordField('loopPerimeterMm')} AS loop_perimeter_mm,
        ${recordField('freeCordLengthMm')} AS free_cord_length_mm, ${recordField('tensionDevice')} AS tension_device,
        ${recordField('tensionDeviceHeightMm')} AS tension_device_height_mm, ${recordField('tensionDeviceHoldN')} AS tension_device_hold_n,
        ${recordField('cleatHeightMm')} AS cleat_height_mm, coalesce(c.last_verdict, 'unchecked') AS verdict,
        (SELECT string_agg(f.clause || ' [' || f.source || ']', '; ' ORDER BY f.id) FROM findings f WHERE f.inspection_id = i.id AND f.verdict = 'fail') AS failed_clauses,
        to_char(i.inspected_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS last_inspected_on, i.kind AS last_inspection_kind,
        CASE WHEN i.confirms_id IS NULL THEN us.name ELSE mu.name END AS measured_by,
        to_char(coalesce(m.inspected_at, i.inspected_at) AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS measured_on,
        CASE WHEN i.confirms_id IS NOT NULL THEN us.name END AS confirmed_by,
        CASE WHEN i.confirms_id IS NOT NULL THEN to_char(i.inspected_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') END AS confirmed_on,
        CASE WHEN c.changed_since_inspection THEN 'yes' ELSE 'no' END AS changed_since_inspection,
        c.status, to_char(r.removed_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS removed_on, ru.name AS removed_by, r.reason AS removal_reason, rc.ref AS replaced_by,
        au.audit_id, au.audit_outcome, au.audit_note,
        (SELECT count(*)::int FROM photos p WHERE p.covering_id = c.id) AS photo_count, i.rules_version
      FROM coverings c JOIN sites s ON s.id = c.site_id JOIN clients cl ON cl.id = s.client_id
      JOIN openings o ON o.id = c.opening_id JOIN units u ON u.id = o.unit_id
      LEFT JOIN inspections i ON i.id = c.last_inspection_id LEFT JOIN users us ON us.id = i.inspector_id
      LEFT JOIN inspections m ON m.id = i.confirms_id LEFT JOIN users mu ON mu.id = m.inspector_id
      LEFT JOIN covering_removals r ON r.covering_id = c.id LEFT JOIN users ru ON ru.id = r.removed_by LEFT JOIN coverings rc ON rc.id = r.replaced_by
      LEFT JOIN LATERAL (SELECT ai.audit_id,
          CASE ai.status WHEN 'confirmed' THEN 'confirmed_unchanged' ELSE ai.status END AS audit_outcome,
          CASE WHEN ai.status = 'not_accessible' THEN ai.reason ELSE ain.notes END AS audit_note
        FROM audit_items ai JOIN audits a ON a.id = ai.audit_id LEFT JOIN inspections ain ON ain.id = ai.inspection_id
        WHERE ai.covering_id = c.id ORDER BY a.opened_at DESC, a.id DESC LIMIT 1) au ON true
      WHERE ${filter} AND c.id > :after ORDER BY c.id LIMIT ${BATCH}`,
    { type: QueryTypes.SELECT, replacements: { scopeId, after } })
    for (const row of rows) {
      const line = auditCsvColumns.map(([key]) => {
        const v = row[key]
        if (v === null || v === undefined) return ''
        if (key === 'tension_device') return v === 'true' ? 'yes' : v === 'false' ? 'no' : ''
        return typeof v === 'number' ? String(v) : neutraliseCell(String(v))
      })
      if (!out.write(line)) await once(out, 'drain')
    }
    if (rows.length < BATCH) break
    after = rows[rows.length - 1]!.id
  }
  out.end()
}

export function auditCsvStream() {
  return stringify({ header: true, bom: true, columns: auditCsvColumns.map(([key]) => key), quoted_match: /^'/ })
}
