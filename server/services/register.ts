import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import type { ClientRow, CoveringDetail, CoveringRemoval, CoveringRow, FindingRow, InspectionRow, OpeningRow, SiteDetail, SiteRow, UnitRow } from '../../shared/types/register'
import { paged } from './paged'
import { clientLimit, likePattern, orderBy, siteScopeSql } from './scope'
import type { Actor } from './scope'

// Read side of the register: paged, sorted, filtered lists scoped to what the actor may see.

interface Page { page: number, pageSize: number, sort: string, q?: string }

const verdictCounts = `
  count(c.id)::int AS "coveringCount",
  count(c.id) FILTER (WHERE c.last_verdict = 'compliant')::int AS "compliantCount",
  count(c.id) FILTER (WHERE c.last_verdict = 'non_compliant')::int AS "nonCompliantCount",
  count(c.id) FILTER (WHERE c.last_verdict = 'incomplete')::int AS "incompleteCount",
  count(c.id) FILTER (WHERE c.last_verdict IS NULL)::int AS "uncheckedCount"`

export function listClients(db: Sequelize, actor: Actor, p: Page) {
  const where = ['cl.workspace_id = :workspaceId']
  const replacements: Record<string, unknown> = { workspaceId: actor.workspaceId }
  const limit = clientLimit(actor)
  if (limit !== undefined) { where.push('cl.id = :clientId'); replacements.clientId = limit }
  if (p.q) { where.push('cl.name ILIKE :q'); replacements.q = likePattern(p.q) }
  return paged<ClientRow>(db, `cl.id, cl.name, cl.contact_name AS "contactName", cl.report_email AS "reportEmail", cl.phone,
      cl.reinspect_interval_months AS "reinspectIntervalMonths",
      (SELECT count(*)::int FROM sites s WHERE s.client_id = cl.id) AS "siteCount"`,
  'clients cl', where, orderBy(p.sort, { name: 'cl.name', createdAt: 'cl.created_at' }, 'cl.id'), replacements, p)
}

export function listSites(db: Sequelize, actor: Actor, p: Page & { id?: number, clientId?: number, jurisdiction?: string, assigned?: 'me' }) {
  const scope = siteScopeSql(actor)
  const where = [scope.sql]
  const replacements: Record<string, unknown> = { ...scope.replacements, me: actor.id }
  if (p.id) { where.push('s.id = :id'); replacements.id = p.id }
  if (p.clientId) { where.push('s.client_id = :clientId'); replacements.clientId = p.clientId }
  if (p.jurisdiction) { where.push('s.jurisdiction = :jurisdiction'); replacements.jurisdiction = p.jurisdiction }
  if (p.assigned === 'me') where.push('EXISTS (SELECT 1 FROM site_assignments a WHERE a.site_id = s.id AND a.user_id = :me)')
  if (p.q) { where.push('(s.name ILIKE :q OR s.address ILIKE :q OR s.ref ILIKE :q)'); replacements.q = likePattern(p.q) }
  return paged<SiteRow>(db, `s.id, s.ref, s.name, s.address, s.jurisdiction, s.premises, s.client_id AS "clientId",
      cl.name AS "clientName", s.updated_at AS "updatedAt", s.notes, k.*,
      EXISTS (SELECT 1 FROM site_assignments a WHERE a.site_id = s.id AND a.user_id = :me) AS "assignedToMe"`,
  `sites s JOIN clients cl ON cl.id = s.client_id
   CROSS JOIN LATERAL (SELECT ${verdictCounts} FROM coverings c WHERE c.site_id = s.id AND c.status = 'in_place') k`,
  where, orderBy(p.sort, { name: 's.name', ref: 's.ref', jurisdiction: 's.jurisdiction', updatedAt: 's.updated_at', failing: 'k."nonCompliantCount"' }, 's.id'),
  replacements, p)
}

export function listUnits(db: Sequelize, actor: Actor, p: Page & { siteId?: number }) {
  const scope = siteScopeSql(actor)
  const where = [scope.sql]
  const replacements: Record<string, unknown> = { ...scope.replacements }
  if (p.siteId) { where.push('u.site_id = :siteId'); replacements.siteId = p.siteId }
  if (p.q) { where.push('(u.ref ILIKE :q OR u.name ILIKE :q)'); replacements.q = likePattern(p.q) }
  return paged<UnitRow>(db, `u.id, u.site_id AS "siteId", u.ref, u.name, u.floor, u.notes, s.name AS "siteName",
      (SELECT count(*)::int FROM coverings c WHERE c.site_id = u.site_id AND c.opening_id IN (SELECT o.id FROM openings o WHERE o.unit_id = u.id) AND c.status = 'in_place') AS "coveringCount",
      (SELECT count(*)::int FROM coverings c JOIN openings o ON o.id = c.opening_id WHERE o.unit_id = u.id AND c.last_verdict = 'non_compliant' AND c.status = 'in_place') AS "nonCompliantCount"`,
  'units u JOIN sites s ON s.id = u.site_id', where,
  orderBy(p.sort, { ref: 'u.ref', name: 'u.name', createdAt: 'u.created_at' }, 'u.id'), replacements, p)
}

export function listOpenings(db: Sequelize, actor: Actor, p: Page & { siteId?: number, unitId?: number }) {
  const scope = siteScopeSql(actor)
  const where = [scope.sql]
  const replacements: Record<string, unknown> = { ...scope.replacements }
  if (p.siteId) { where.push('o.site_id = :siteId'); replacements.siteId = p.siteId }
  if (p.unitId) { where.push('o.unit_id = :unitId'); replacements.unitId = p.unitId }
  if (p.q) { where.push('(o.ref ILIKE :q OR o.room ILIKE :q)'); replacements.q = likePattern(p.q) }
  return paged<OpeningRow>(db, `o.id, o.site_id AS "siteId", o.unit_id AS "unitId", u.ref AS "unitRef", o.ref, o.room, o.kind,
      o.childrens_room AS "childrensRoom", o.recess_width_mm AS "recessWidthMm", o.recess_height_mm AS "recessHeightMm", o.notes`,
  'openings o JOIN units u ON u.id = o.unit_id JOIN sites s ON s.id = o.site_id', where,
  orderBy(p.sort, { ref: 'o.ref', room: 'o.room', createdAt: 'o.created_at' }, 'o.id'), replacements, p)
}

export const coveringSelect = `c.id, c.site_id AS "siteId", s.name AS "siteName", s.jurisdiction, c.opening_id AS "openingId",
  o.ref AS "openingRef", o.room, o.unit_id AS "unitId", u.ref AS "unitRef", c.ref, c.product_type AS "productType",
  c.control, c.made_to AS "madeTo", c.mount, c.fixing, c.control_side AS "controlSide", c.width_mm AS "widthMm",
  c.drop_mm AS "dropMm", c.maker_model AS "makerModel", c.manufactured_on AS "manufacturedOn",
  to_char(c.installed_on, 'YYYY-MM-DD') AS "installedOn", c.status, c.last_verdict AS "lastVerdict",
  c.last_inspected_at AS "lastInspectedAt", c.last_inspection_id AS "lastInspectionId",
  c.changed_since_inspection AS "changedSinceInspection", c.changed_fields AS "changedFields", c.changed_at AS "changedAt"`
export const coveringFrom = 'coverings c JOIN openings o ON o.id = c.opening_id JOIN units u ON u.id = o.unit_id JOIN sites s ON s.id = c.site_id'

export function listCoverings(db: Sequelize, actor: Actor, p: Page & { siteId?: number, unitId?: number, openingId?: number, verdict?: string, control?: string }) {
  const scope = siteScopeSql(actor)
  const where = [scope.sql]
  const replacements: Record<string, unknown> = { ...scope.replacements }
  if (p.siteId) { where.push('c.site_id = :siteId'); replacements.siteId = p.siteId }
  if (p.unitId) { where.push('o.unit_id = :unitId'); replacements.unitId = p.unitId }
  if (p.openingId) { where.push('c.opening_id = :openingId'); replacements.openingId = p.openingId }
  if (p.control) { where.push('c.control = :control'); replacements.control = p.control }
  if (p.verdict === 'unchecked') where.push('c.last_verdict IS NULL')
  else if (p.verdict) { where.push('c.last_verdict = :verdict'); replacements.verdict = p.verdict }
  if (p.q) { where.push('(c.ref ILIKE :q OR o.room ILIKE :q OR u.ref ILIKE :q OR c.maker_model ILIKE :q)'); replacements.q = likePattern(p.q) }
  return paged<CoveringRow>(db, coveringSelect, coveringFrom, where,
    orderBy(p.sort, { ref: 'c.ref', productType: 'c.product_type', control: 'c.control', lastVerdict: 'c.last_verdict', lastInspectedAt: 'c.last_inspected_at' }, 'c.id'),
    replacements, p)
}

export async function getSite(db: Sequelize, actor: Actor, id: number): Promise<SiteDetail | null> {
  const { items } = await listSites(db, actor, { id, page: 1, pageSize: 1, sort: 'name' })
  return (items[0] as SiteDetail | undefined) ?? null
}

export async function getCovering(db: Sequelize, actor: Actor, id: number): Promise<CoveringDetail | null> {
  const scope = siteScopeSql(actor)
  const [row] = await db.query<CoveringDetail>(`SELECT ${coveringSelect}, s.client_id AS "clientId", o.childrens_room AS "childrensRoom"
    FROM ${coveringFrom} WHERE c.id = :id AND ${scope.sql}`, { type: QueryTypes.SELECT, replacements: { ...scope.replacements, id } })
  if (!row) return null
  const inspections = await db.query<InspectionRow & { findings: FindingRow[] }>(`SELECT i.id, i.kind, i.inspected_at AS "inspectedAt",
      us.name AS "inspectorName", i.rules_version AS "rulesVersion", i.verdict, i.notes, i.record, i.confirms_id AS "confirmsId",
      CASE WHEN i.confirms_id IS NULL THEN us.name ELSE mu.name END AS "measuredByName", coalesce(m.inspected_at, i.inspected_at) AS "measuredAt",
      COALESCE((SELECT json_agg(json_build_object('clause', f.clause, 'verdict', f.verdict, 'measured', f.measured, 'limit', f.limit_value,
        'unit', f.unit, 'field', f.field, 'source', f.source, 'basis', f.basis, 'message', f.message, 'fix', f.fix) ORDER BY f.id)
        FROM findings f WHERE f.inspection_id = i.id), '[]') AS findings
    FROM inspections i LEFT JOIN users us ON us.id = i.inspector_id
      LEFT JOIN inspections m ON m.id = i.confirms_id LEFT JOIN users mu ON mu.id = m.inspector_id
    WHERE i.covering_id = :id ORDER BY i.inspected_at DESC, i.id DESC LIMIT 50`, { type: QueryTypes.SELECT, replacements: { id } })
  const [removal] = await db.query<CoveringRemoval>(`SELECT r.id, r.removed_at AS "removedAt", ru.name AS "removedByName", r.reason, r.photo_id AS "photoId",
      r.replaced_by AS "replacedById", rc.ref AS "replacedByRef"
    FROM covering_removals r LEFT JOIN users ru ON ru.id = r.removed_by LEFT JOIN coverings rc ON rc.id = r.replaced_by
    WHERE r.covering_id = :id`, { type: QueryTypes.SELECT, replacements: { id } })
  return { ...row, inspections, removal: removal ?? null }
}
