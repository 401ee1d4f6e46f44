// Plain JSON shapes the API returns for the register. Dates are ISO strings at the edges.
export type Verdict = 'compliant' | 'non_compliant' | 'incomplete' | 'not_applicable'

export interface VerdictCounts {
  coveringCount: number
  compliantCount: number
  nonCompliantCount: number
  incompleteCount: number
  uncheckedCount: number
}

export interface ClientRow {
  id: number
  name: string
  contactName: string | null
  reportEmail: string
  phone: string | null
  reinspectIntervalMonths: number
  siteCount: number
}

export interface SiteRow extends VerdictCounts {
  id: number
  ref: string
  name: string
  address: string
  jurisdiction: 'AU' | 'CA' | 'US' | 'EU'
  premises: string
  clientId: number
  clientName: string
  updatedAt: string
  assignedToMe: boolean
}

export interface SiteDetail extends SiteRow { notes: string | null }

export interface UnitRow {
  id: number
  siteId: number
  siteName: string
  ref: string
  name: string | null
  floor: string | null
  notes: string | null
  coveringCount: number
  nonCompliantCount: number
}

export interface OpeningRow {
  id: number
  siteId: number
  unitId: number
  unitRef: string
  ref: string
  room: string
  kind: 'window' | 'door' | 'other'
  childrensRoom: boolean
  recessWidthMm: number | null
  recessHeightMm: number | null
  notes: string | null
}

export interface CoveringRow {
  id: number
  siteId: number
  siteName: string
  jurisdiction: 'AU' | 'CA' | 'US' | 'EU'
  openingId: number
  openingRef: string
  room: string
  unitId: number
  unitRef: string
  ref: string
  productType: string
  control: string
  madeTo: string | null
  mount: 'inside' | 'outside' | null
  fixing: 'top' | 'face' | null
  controlSide: 'left' | 'right' | 'centre' | null
  widthMm: number | null
  dropMm: number | null
  makerModel: string | null
  manufacturedOn: string | null
  installedOn: string | null
  status: 'in_place' | 'removed'
  lastVerdict: Verdict | null
  lastInspectedAt: string | null
  lastInspectionId: number | null
  /** A field the rules read was edited after the last inspection: the verdict shown is the last inspected one. */
  changedSinceInspection: boolean
  /** Which fields, as `entity.field` (covering.control, opening.childrensRoom, site.premises…). */
  changedFields: string[]
  changedAt: string | null
}

export interface FindingRow {
  clause: string
  verdict: 'pass' | 'fail' | 'missing' | 'not_applicable' | 'advice'
  measured: string | null
  limit: string | null
  unit: string | null
  field: string | null
  source: string
  basis: string
  message: string
  fix: string | null
}

export interface InspectionRow {
  id: number
  kind: 'fitting' | 'audit' | 'import' | 'correction'
  inspectedAt: string
  inspectorName: string | null
  rulesVersion: string
  verdict: Verdict
  notes: string | null
  record: Record<string, unknown>
  findings: FindingRow[]
  /** For an audit confirmation: the inspection whose measurements were confirmed unchanged. */
  confirmsId: number | null
  /** Who took the measurements this record holds, and when (the confirmed inspection's, for a confirmation). */
  measuredByName: string | null
  measuredAt: string
}

export interface CoveringRemoval {
  id: number
  removedAt: string
  removedByName: string | null
  reason: string
  photoId: number | null
  replacedById: number | null
  replacedByRef: string | null
}

export interface CoveringDetail extends CoveringRow {
  clientId: number
  childrensRoom: boolean
  inspections: InspectionRow[]
  removal: CoveringRemoval | null
}

export interface ActivityRow {
  id: number
  at: string
  userName: string | null
  action: string
  entity: string
  entityId: number | null
  detail: Record<string, unknown>
}
