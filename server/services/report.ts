import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { PDFDocument, rgb } from 'pdf-lib'
import type { Color, PDFFont, PDFImage, PDFPage } from 'pdf-lib'
import { jurisdictions, ruleSets } from '../../rules'
import type { Jurisdiction } from '../../rules'
import { drawable, embedPublicSans, fontCoverage, fontMetrics, needsExt, preloadFonts, textRuns } from './pdf-fonts'
import type { Coverage, Face, Weight } from './pdf-fonts'
import { StorageUnavailableError, getObjectBytes } from './storage'

// The landlord's report for one site: loaded in a few queries (loadSiteReport), drawn without I/O
// (renderSiteReport), so the drawing can be timed on its own and the data reused for e-mail.

export const PRODUCT_NAME = 'Tautline'

/** Scope and caution: on the cover, at the end, and in every e-mail that carries the report. It never claims to certify. */
export const REPORT_CAUTION = 'Tautline supports the judgement of trained installers and compliance officers; it does not certify any covering, installation or premises, and this report is not a certificate. Local codes and regulations, licensed professional practice and each product\'s own instructions prevail over anything in this report.'
export const REPORT_HAZARD = 'Cords and chains can strangle young children. Where a failed covering is within a child\'s reach, act on its remedy now rather than at the next inspection.'

export type CoveringVerdict = 'compliant' | 'non_compliant' | 'incomplete' | 'not_applicable'
export type VerdictKey = CoveringVerdict | 'not_checked'
export const verdictOrder: readonly VerdictKey[] = ['compliant', 'non_compliant', 'incomplete', 'not_applicable', 'not_checked']
export const verdictWords: Record<VerdictKey, string> = {
  compliant: 'Compliant', non_compliant: 'Non-compliant', incomplete: 'Incomplete', not_applicable: 'Not applicable', not_checked: 'Not yet checked',
}

/** Photos drawn per failed covering; the rest are counted and stay in the register. */
export const PHOTOS_PER_COVERING = 8
/** Thumbnails fetched from S3 at once: enough to hide latency, few enough to spare the store. */
export const THUMBNAIL_CONCURRENCY = 8

export interface ReportCovering {
  id: number
  ref: string
  openingRef: string
  room: string
  childrensRoom: boolean
  productType: string
  control: string
  widthMm: number | null
  dropMm: number | null
  verdict: VerdictKey
  inspectedOn: string | null
  inspectionKind: string | null
  /** Who measured what the verdict rests on, and when; a confirmation at an audit never replaces them. */
  measuredBy?: string | null
  measuredOn?: string | null
  /** Set when the latest inspection confirmed an earlier measurement unchanged. */
  confirmedOn?: string | null
  /** What the latest closed audit did with this covering, when it listed it. */
  auditOutcome?: AuditOutcome | null
}

export type AuditOutcome = 'measured' | 'confirmed' | 'not_accessible' | 'pending'

/** The latest closed audit of the site, covering by covering. */
export interface ReportAudit {
  id: number
  closedOn: string | null
  officerName: string | null
  measured: number
  confirmed: number
  notAccessible: Array<{ ref: string, unitRef: string, room: string, reason: string }>
}

/** A covering taken out of service since the last report was sent (or ever, if none was). */
export interface ReportRemoval { ref: string, unitRef: string, room: string, removedOn: string, removedBy: string | null, reason: string, replacedByRef: string | null, lastVerdict: VerdictKey }

export interface ReportUnit { ref: string, name: string | null, floor: string | null, coverings: ReportCovering[] }

export interface ReportFinding {
  clause: string
  title: string | null
  verdict: 'fail' | 'missing'
  measured: string | null
  limit: string | null
  unit: string | null
  source: string
  basis: string
  message: string
  fix: string | null
  remedy: { priority: number, dueOn: string, overdue: boolean } | null
}

export interface ReportPhoto { id: number, kind: string, thumbKey: string | null, takenOn: string | null }

export interface FailedCovering {
  id: number
  ref: string
  unitRef: string
  room: string
  childrensRoom: boolean
  productType: string
  control: string
  widthMm: number | null
  dropMm: number | null
  inspectedOn: string | null
  inspectionKind: string | null
  /** Who took the measurements the verdict rests on, and when; for an audit confirmation, who confirmed them and when. */
  measuredBy: string | null
  measuredOn: string | null
  confirmedBy: string | null
  confirmedOn: string | null
  /** Why the latest closed audit could not check this covering, if it could not. */
  notAccessibleReason?: string | null
  rulesVersion: string | null
  findings: ReportFinding[]
  photos: ReportPhoto[]
  /** Every photo of the covering in the register, of which `photos` are drawn. */
  photoCount: number
}

export interface SiteReportData {
  generatedOn: string
  business: { name: string, phone: string | null, email: string | null, address: string | null, licenceNumber: string | null }
  client: { name: string, contactName: string | null, reportEmail: string }
  site: { id: number, workspaceId: number, ref: string, name: string, address: string, jurisdiction: string, premises: string }
  ruleSets: Array<{ version: string, name: string, current: boolean, coverings: number }>
  summary: Record<VerdictKey, number> & { total: number, openRemedies: number, overdueRemedies: number }
  units: ReportUnit[]
  failures: FailedCovering[]
  audit: ReportAudit | null
  /** Coverings removed since `removalsSince` (the day the last report was sent; null: no report was sent). */
  removals: ReportRemoval[]
  removalsSince: string | null
  signOff: { officerName: string | null, closedOn: string | null }
}

export class SiteNotFoundError extends Error {}

// ---------------------------------------------------------------------------------------------
// Loading: four queries, run together, whatever the number of coverings.

// Unit U2 before U10: refs compare with their numbers as numbers.
const refOrder = new Intl.Collator('en', { numeric: true, sensitivity: 'base' })

interface HeadRow {
  id: number
  workspaceId: number
  ref: string
  name: string
  address: string
  jurisdiction: string
  premises: string
  clientName: string
  contactName: string | null
  reportEmail: string
  businessName: string
  businessPhone: string | null
  businessEmail: string | null
  businessAddress: string | null
  licenceNumber: string | null
  officerName: string | null
  closedOn: string | null
  auditId: number | null
  lastReportOn: string | null
  openRemedies: number
  overdueRemedies: number
}
interface CoveringRow {
  id: number
  ref: string
  openingRef: string
  room: string
  childrensRoom: boolean
  productType: string
  control: string
  widthMm: number | null
  dropMm: number | null
  verdict: CoveringVerdict | null
  unitRef: string
  unitName: string | null
  floor: string | null
  inspectedOn: string | null
  inspectionKind: string | null
  rulesVersion: string | null
  measuredBy: string | null
  measuredOn: string | null
  confirmedBy: string | null
  confirmedOn: string | null
}
interface AuditItemRow { coveringId: number, status: AuditOutcome, reason: string | null }
interface RemovalRow extends ReportRemoval { lastVerdict: VerdictKey }
interface FindingRow {
  coveringId: number
  clause: string
  verdict: 'fail' | 'missing'
  measured: string | null
  limit: string | null
  unit: string | null
  source: string
  basis: string
  message: string
  fix: string | null
  priority: number | null
  dueOn: string | null
  overdue: boolean | null
}
interface PhotoRow { id: number, coveringId: number, kind: string, thumbKey: string | null, takenOn: string | null, total: number }

const clauseTitles = new Map<string, string>(jurisdictions.flatMap(j => ruleSets[j].clauses.map(c => [c.id, c.title] as const)))

function today(): string {
  return new Date().toISOString().slice(0, 10)
}

/**
 * Everything the report shows for a site, as plain data. Callers check tenancy first. Only coverings in place
 * count; dates are UTC days, as the rulebook dates an inspection.
 */
export function loadSiteReport(db: Sequelize, siteId: number): Promise<SiteReportData> {
  return querySiteReport(db, siteId)
}

/** The queries behind loadSiteReport; `onPhotos` hears the photo rows as soon as they arrive, before the rest. */
async function querySiteReport(db: Sequelize, siteId: number, onPhotos?: (photos: PhotoRow[]) => void): Promise<SiteReportData> {
  const q = <T extends object>(sql: string) => db.query<T>(sql, { type: QueryTypes.SELECT, replacements: { siteId, max: PHOTOS_PER_COVERING } })
  const [heads, coverings, findings, photos, auditItems, removals] = await Promise.all([
    q<HeadRow>(`SELECT s.id, s.workspace_id AS "workspaceId", s.ref, s.name, s.address, s.jurisdiction, s.premises,
        cl.name AS "clientName", cl.contact_name AS "contactName", cl.report_email AS "reportEmail",
        w.name AS "businessName", w.contact_phone AS "businessPhone", w.contact_email AS "businessEmail", w.address AS "businessAddress",
        w.licence_number AS "licenceNumber", a.closed_by_name AS "officerName", a.id AS "auditId",
        to_char(a.closed_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS "closedOn", r.open AS "openRemedies", r.overdue AS "overdueRemedies",
        (SELECT to_char(max(d.created_at) AT TIME ZONE 'UTC', 'YYYY-MM-DD') FROM report_dispatches d WHERE d.site_id = s.id AND d.status <> 'failed') AS "lastReportOn"
      FROM sites s JOIN clients cl ON cl.id = s.client_id JOIN workspaces w ON w.id = s.workspace_id
      LEFT JOIN LATERAL (SELECT id, closed_by_name, closed_at FROM audits WHERE site_id = s.id AND status = 'closed'
        ORDER BY closed_at DESC, id DESC LIMIT 1) a ON true
      CROSS JOIN LATERAL (SELECT count(*) FILTER (WHERE status = 'open')::int AS open,
        count(*) FILTER (WHERE status = 'open' AND due_on < current_date)::int AS overdue FROM fixes WHERE site_id = s.id) r
      WHERE s.id = :siteId`),
    q<CoveringRow>(`SELECT c.id, c.ref, o.ref AS "openingRef", o.room, o.childrens_room AS "childrensRoom", c.product_type AS "productType",
        c.control, c.width_mm AS "widthMm", c.drop_mm AS "dropMm", c.last_verdict AS verdict, u.ref AS "unitRef", u.name AS "unitName",
        u.floor, to_char(i.inspected_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS "inspectedOn", i.kind AS "inspectionKind",
        i.rules_version AS "rulesVersion",
        CASE WHEN i.confirms_id IS NULL THEN p.name ELSE mp.name END AS "measuredBy",
        to_char(coalesce(m.inspected_at, i.inspected_at) AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS "measuredOn",
        CASE WHEN i.confirms_id IS NOT NULL THEN p.name END AS "confirmedBy",
        CASE WHEN i.confirms_id IS NOT NULL THEN to_char(i.inspected_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') END AS "confirmedOn"
      FROM coverings c JOIN openings o ON o.id = c.opening_id JOIN units u ON u.id = o.unit_id
      LEFT JOIN inspections i ON i.id = c.last_inspection_id LEFT JOIN users p ON p.id = i.inspector_id
      LEFT JOIN inspections m ON m.id = i.confirms_id LEFT JOIN users mp ON mp.id = m.inspector_id
      WHERE c.site_id = :siteId AND c.status = 'in_place'`),
    q<FindingRow>(`SELECT c.id AS "coveringId", f.clause, f.verdict, f.measured, f.limit_value AS "limit", f.unit, f.source, f.basis,
        f.message, f.fix, x.priority, to_char(x.due_on, 'YYYY-MM-DD') AS "dueOn", x.due_on < current_date AS overdue
      FROM coverings c JOIN findings f ON f.inspection_id = c.last_inspection_id
      LEFT JOIN fixes x ON x.covering_id = c.id AND x.clause = f.clause AND x.status = 'open'
      WHERE c.site_id = :siteId AND c.status = 'in_place' AND c.last_verdict = 'non_compliant' AND f.verdict IN ('fail', 'missing')
      ORDER BY c.id, f.verdict = 'fail' DESC, f.id`),
    // Photos of this inspection first, then the newest; only the first few per covering are drawn.
    q<PhotoRow>(`SELECT id, "coveringId", kind, "thumbKey", "takenOn", total FROM (
        SELECT p.id, p.covering_id AS "coveringId", p.kind, p.thumb_key AS "thumbKey",
          to_char(coalesce(p.captured_at, p.created_at) AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS "takenOn",
          row_number() OVER (PARTITION BY p.covering_id ORDER BY (ip.photo_id IS NOT NULL) DESC, p.created_at DESC, p.id DESC) AS n,
          count(*) OVER (PARTITION BY p.covering_id)::int AS total
        FROM photos p JOIN coverings c ON c.id = p.covering_id
        LEFT JOIN inspection_photos ip ON ip.inspection_id = c.last_inspection_id AND ip.photo_id = p.id
        WHERE c.site_id = :siteId AND c.status = 'in_place' AND c.last_verdict = 'non_compliant'
      ) ranked WHERE n <= :max ORDER BY "coveringId", n`).then((rows) => {
      onPhotos?.(rows)
      return rows
    }),
    // The latest closed audit's outcome for each covering it listed.
    q<AuditItemRow>(`SELECT ai.covering_id AS "coveringId", ai.status, ai.reason FROM audit_items ai
      WHERE ai.audit_id = (SELECT id FROM audits WHERE site_id = :siteId AND status = 'closed' ORDER BY closed_at DESC, id DESC LIMIT 1)`),
    q<RemovalRow>(`SELECT c.ref, u.ref AS "unitRef", o.room, to_char(r.removed_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS "removedOn", ru.name AS "removedBy",
        r.reason, rc.ref AS "replacedByRef", coalesce(c.last_verdict, 'not_checked') AS "lastVerdict"
      FROM covering_removals r JOIN coverings c ON c.id = r.covering_id JOIN openings o ON o.id = c.opening_id JOIN units u ON u.id = o.unit_id
      LEFT JOIN users ru ON ru.id = r.removed_by LEFT JOIN coverings rc ON rc.id = r.replaced_by
      WHERE c.site_id = :siteId AND r.removed_at > coalesce((SELECT max(d.created_at) FROM report_dispatches d WHERE d.site_id = :siteId AND d.status <> 'failed'), '-infinity')
      ORDER BY r.removed_at, r.id`),
    // Fonts are read here, so that drawing does no file I/O.
    preloadFonts(),
  ])
  const head = heads[0]
  if (!head) throw new SiteNotFoundError(`site ${siteId} not found`)

  coverings.sort((a, b) => refOrder.compare(a.unitRef, b.unitRef) || refOrder.compare(a.openingRef, b.openingRef) || refOrder.compare(a.ref, b.ref))
  const summary = { compliant: 0, non_compliant: 0, incomplete: 0, not_applicable: 0, not_checked: 0, total: coverings.length,
    openRemedies: head.openRemedies, overdueRemedies: head.overdueRemedies }
  const units: ReportUnit[] = []
  const versions = new Map<string, number>()
  const outcomes = new Map(auditItems.map(a => [a.coveringId, a]))
  for (const c of coverings) {
    const verdict: VerdictKey = c.verdict ?? 'not_checked'
    summary[verdict]++
    if (c.rulesVersion) versions.set(c.rulesVersion, (versions.get(c.rulesVersion) ?? 0) + 1)
    let unit = units[units.length - 1]
    if (!unit || unit.ref !== c.unitRef) units.push(unit = { ref: c.unitRef, name: c.unitName, floor: c.floor, coverings: [] })
    unit.coverings.push({ id: c.id, ref: c.ref, openingRef: c.openingRef, room: c.room, childrensRoom: c.childrensRoom, productType: c.productType,
      control: c.control, widthMm: c.widthMm, dropMm: c.dropMm, verdict, inspectedOn: c.inspectedOn, inspectionKind: c.inspectionKind,
      measuredBy: c.measuredBy, measuredOn: c.measuredOn, confirmedOn: c.confirmedOn, auditOutcome: outcomes.get(c.id)?.status ?? null })
  }

  const findingsBy = groupBy(findings, f => f.coveringId)
  const photosBy = groupBy(photos, p => p.coveringId)
  const failures: FailedCovering[] = coverings.filter(c => c.verdict === 'non_compliant').map(c => ({
    id: c.id, ref: c.ref, unitRef: c.unitRef, room: c.room, childrensRoom: c.childrensRoom, productType: c.productType, control: c.control,
    widthMm: c.widthMm, dropMm: c.dropMm, inspectedOn: c.inspectedOn, inspectionKind: c.inspectionKind,
    measuredBy: c.measuredBy, measuredOn: c.measuredOn, confirmedBy: c.confirmedBy, confirmedOn: c.confirmedOn, rulesVersion: c.rulesVersion,
    notAccessibleReason: outcomes.get(c.id)?.status === 'not_accessible' ? outcomes.get(c.id)!.reason : null,
    findings: (findingsBy.get(c.id) ?? []).map(f => ({
      clause: f.clause, title: clauseTitles.get(f.clause) ?? null, verdict: f.verdict, measured: f.measured, limit: f.limit, unit: f.unit,
      source: f.source, basis: f.basis, message: f.message, fix: f.fix,
      remedy: f.priority !== null && f.dueOn !== null ? { priority: f.priority, dueOn: f.dueOn, overdue: f.overdue === true } : null,
    })),
    photos: (photosBy.get(c.id) ?? []).map(p => ({ id: p.id, kind: p.kind, thumbKey: p.thumbKey, takenOn: p.takenOn })),
    photoCount: photosBy.get(c.id)?.[0]?.total ?? 0,
  }))

  const set = ruleSets[head.jurisdiction as Jurisdiction]
  const usedSets = [...versions].sort(([a], [b]) => refOrder.compare(a, b)).map(([version, n]) => {
    const own = ruleSets[version.slice(0, 2) as Jurisdiction]
    return { version, name: own?.name ?? version.slice(0, 2), current: own?.version === version, coverings: n }
  })
  // A site nobody has checked yet still names the rule set its coverings will be checked against.
  if (!usedSets.length && set) usedSets.push({ version: set.version, name: set.name, current: true, coverings: 0 })

  return {
    generatedOn: today(),
    business: { name: head.businessName, phone: head.businessPhone, email: head.businessEmail, address: head.businessAddress, licenceNumber: head.licenceNumber },
    client: { name: head.clientName, contactName: head.contactName, reportEmail: head.reportEmail },
    site: { id: head.id, workspaceId: head.workspaceId, ref: head.ref, name: head.name, address: head.address, jurisdiction: head.jurisdiction, premises: head.premises },
    ruleSets: usedSets,
    summary,
    units,
    failures,
    audit: head.auditId
      ? {
          id: head.auditId, closedOn: head.closedOn, officerName: head.officerName,
          measured: auditItems.filter(a => a.status === 'measured').length,
          confirmed: auditItems.filter(a => a.status === 'confirmed').length,
          notAccessible: coverings.filter(c => outcomes.get(c.id)?.status === 'not_accessible')
            .map(c => ({ ref: c.ref, unitRef: c.unitRef, room: c.room, reason: outcomes.get(c.id)!.reason ?? '' })),
        }
      : null,
    removals,
    removalsSince: head.lastReportOn,
    signOff: { officerName: head.officerName, closedOn: head.closedOn },
  }
}

function groupBy<T, K>(rows: T[], key: (row: T) => K): Map<K, T[]> {
  const out = new Map<K, T[]>()
  for (const row of rows) {
    const k = key(row)
    const list = out.get(k)
    if (list) list.push(row)
    else out.set(k, [row])
  }
  return out
}

/**
 * The stored thumbnails (JPEG, at most 480 px) of the photos the report draws, a few fetches at a time.
 * A missing object is left out and drawn as unavailable; an unreachable store throws StorageUnavailableError.
 */
export function loadReportThumbnails(data: SiteReportData, concurrency = THUMBNAIL_CONCURRENCY): Promise<Map<number, Uint8Array>> {
  return fetchThumbnails(data.failures.flatMap(f => f.photos), concurrency)
}

async function fetchThumbnails(photos: Array<{ id: number, thumbKey: string | null }>, concurrency = THUMBNAIL_CONCURRENCY): Promise<Map<number, Uint8Array>> {
  const wanted = photos.filter((p): p is { id: number, thumbKey: string } => p.thumbKey !== null)
  const out = new Map<number, Uint8Array>()
  let next = 0
  let broken: unknown = null
  const worker = async () => {
    while (next < wanted.length && !broken) {
      const photo = wanted[next++]!
      try {
        out.set(photo.id, await getObjectBytes(photo.thumbKey))
      }
      catch (err) {
        if (err instanceof StorageUnavailableError) broken = err
      }
    }
  }
  await Promise.all(Array.from({ length: Math.min(concurrency, wanted.length) }, worker))
  if (broken) throw broken
  return out
}

/**
 * Load, fetch thumbnails and draw: the whole report for a site. Thumbnails start downloading as soon as the photo
 * rows arrive, and keep going while the other queries run and the cover and tables are drawn.
 */
export async function buildSiteReport(db: Sequelize, siteId: number) {
  let early: Promise<Map<number, Uint8Array>> | undefined
  const data = await querySiteReport(db, siteId, (photos) => {
    early = fetchThumbnails(photos)
    // Awaited by the drawing; this only keeps a failure from going unhandled if the queries fail first.
    early.catch(() => undefined)
  })
  const pdf = await drawReport(data, early ?? Promise.resolve(new Map<number, Uint8Array>()))
  return { data, pdf }
}

export function reportFileName(siteRef: string, generatedOn: string): string {
  // Refs may hold spaces, slashes and #; a file name keeps only safe characters.
  const safeRef = siteRef.replace(/[^\w.-]+/g, '-').replace(/^-+|-+$/g, '') || 'site'
  return `tautline-report-${safeRef}-${generatedOn}.pdf`
}

export function reportPdfHeaders(siteRef: string, generatedOn: string): Record<string, string> {
  return {
    'Content-Type': 'application/pdf',
    'Content-Disposition': `inline; filename="${reportFileName(siteRef, generatedOn)}"`,
    'Cache-Control': 'private, no-store',
  }
}

// ---------------------------------------------------------------------------------------------
// Words.

const months = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec']
const monthsLong = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December']

/** 2026-11-05 → 5 Nov 2026: day first and the month in letters, so no reader mistakes it. */
export function formatDay(iso: string | null, long = false): string {
  if (!iso) return '—'
  const [y, m, d] = iso.split('-').map(Number)
  if (!y || !m || !d) return iso
  return `${d} ${(long ? monthsLong : months)[m - 1]} ${y}`
}

const sentence = (code: string) => {
  const words = code.replace(/_/g, ' ')
  return words.charAt(0).toUpperCase() + words.slice(1)
}
const productWords: Record<string, string> = { venetian: 'Venetian', cellular: 'Cellular' }
const controlWords: Record<string, string> = { chain_loop: 'Chain loop', cord_loop: 'Cord loop', free_cord: 'Free cord', wand: 'Wand', motorised: 'Motorised', cordless: 'Cordless' }
const auditWords: Record<AuditOutcome, string> = { measured: 'Re-measured at audit', confirmed: 'Confirmed at audit', not_accessible: 'Not accessible at audit', pending: 'Not reached at audit' }
const kindWords: Record<string, string> = { fitting: 'Fitting', audit: 'Audit', import: 'Import', correction: 'Correction' }
const photoKindWords: Record<string, string> = { whole: 'Whole covering', tension_device: 'Tension device', cleat: 'Cleat', labels: 'Labels', defect: 'Defect' }
const basisWords: Record<string, string> = {
  published: 'Published text of the requirement',
  secondary: 'Secondary source explaining the requirement',
  common_practice: 'Common trade practice',
  memory: 'Recalled; not yet checked against the text',
}
const premisesWords: Record<string, string> = { rental_home: 'Rental home', childcare: 'Childcare', healthcare: 'Healthcare' }

const product = (code: string) => productWords[code] ?? sentence(code)
const control = (code: string) => controlWords[code] ?? sentence(code)
const sizeMm = (w: number | null, d: number | null) => (w || d ? `${w ?? '?'} × ${d ?? '?'}` : '—')

/** A measured value or limit with its unit; flags read as yes and no. */
function valueWithUnit(value: string | null, unit: string | null): string {
  if (value === null || value === '') return 'not recorded'
  if (value === 'true') return 'yes'
  if (value === 'false') return 'no'
  return unit ? `${value} ${unit}` : value
}

// ---------------------------------------------------------------------------------------------
// Drawing.

const hex = (h: string) => rgb(Number.parseInt(h.slice(1, 3), 16) / 255, Number.parseInt(h.slice(3, 5), 16) / 255, Number.parseInt(h.slice(5, 7), 16) / 255)
const c = {
  spruce: hex('#1d3b36'),
  spruceMid: hex('#3d5f58'),
  spruceTint: hex('#e3ebe7'),
  spruceOnDark: hex('#c5d6cf'),
  paper: hex('#faf8f4'),
  sand: hex('#f1ece3'),
  line: hex('#ddd5c8'),
  stone: hex('#6e665b'),
  ink: hex('#24211d'),
  white: rgb(1, 1, 1),
}
const verdictColours: Record<VerdictKey, Color> = {
  compliant: hex('#2f6b4c'),
  non_compliant: hex('#a63a2b'),
  incomplete: hex('#a36d12'),
  not_applicable: hex('#8a8378'),
  not_checked: hex('#52606d'),
}
const failTint = hex('#f7e9e4')

const ptPerMm = 72 / 25.4
const pageSizes = { A4: [210 * ptPerMm, 297 * ptPerMm], Letter: [612, 792] } as const

/** Letter in North America, A4 elsewhere, as the client's printer will be loaded. */
export function pageSizeFor(jurisdiction: string): keyof typeof pageSizes {
  return jurisdiction === 'US' || jurisdiction === 'CA' ? 'Letter' : 'A4'
}

interface TextStyle { size: number, weight?: Weight, color?: Color }

/**
 * Sets text in Public Sans. Widths add up each glyph's advance (what pdf-lib draws: it applies no kerning)
 * instead of shaping every string, and each distinct string is encoded once: shaping was most of the drawing time.
 */
class Pen {
  private readonly advances: Record<Weight, Map<number, number>> = { regular: new Map(), bold: new Map() }
  constructor(private readonly faces: Record<Weight, Face>, private readonly coverage: Coverage, private readonly metrics: Record<Weight, Coverage>) {
    for (const face of Object.values(faces)) for (const font of [face.main, face.ext]) if (font) memoiseEncoding(font)
  }

  /** Advance of one character at 1 pt, from the subset that will draw it. */
  private advance(cp: number, weight: Weight): number {
    const cache = this.advances[weight]
    let w = cache.get(cp)
    if (w === undefined) {
      const m = this.metrics[weight]
      const kit = !this.faces[weight].ext || m.main.hasGlyphForCodePoint(cp) ? m.main : m.ext
      w = kit.glyphForCodePoint(cp).advanceWidth / kit.unitsPerEm
      cache.set(cp, w)
    }
    return w
  }

  width(text: string, style: TextStyle): number {
    const weight = style.weight ?? 'regular'
    let unit = 0
    for (let i = 0; i < text.length; i++) {
      const cp = text.codePointAt(i)!
      if (cp > 0xffff) i++
      unit += this.advance(cp, weight)
    }
    return unit * style.size
  }

  draw(page: PDFPage, text: string, x: number, y: number, style: TextStyle) {
    if (!text) return
    const weight = style.weight ?? 'regular'
    for (const run of textRuns(text, this.faces[weight], this.coverage)) {
      page.drawText(run.text, { x, y, size: style.size, font: run.font, color: style.color ?? c.ink })
      x += this.width(run.text, style)
    }
  }

  drawRight(page: PDFPage, text: string, right: number, y: number, style: TextStyle) {
    this.draw(page, text, right - this.width(text, style), y, style)
  }

  /** Cuts text to the width with a trailing ellipsis (whole text when it fits). */
  truncate(text: string, style: TextStyle, maxWidth: number): string {
    if (this.width(text, style) <= maxWidth) return text
    const chars = [...text]
    let lo = 0
    let hi = chars.length
    while (lo < hi) {
      const mid = Math.ceil((lo + hi) / 2)
      if (this.width(`${chars.slice(0, mid).join('').trimEnd()}…`, style) <= maxWidth) lo = mid
      else hi = mid - 1
    }
    return lo === 0 ? '…' : `${chars.slice(0, lo).join('').trimEnd()}…`
  }

  /** Word-wraps to the width; a word longer than a line is broken between letters. At most maxLines, the last cut with an ellipsis. */
  wrap(text: string, style: TextStyle, maxWidth: number, maxLines = Number.POSITIVE_INFINITY): string[] {
    const lines: string[] = []
    let line = ''
    for (const word of text.split(' ').filter(Boolean)) {
      const candidate = line ? `${line} ${word}` : word
      if (this.width(candidate, style) <= maxWidth) {
        line = candidate
        continue
      }
      if (line) lines.push(line)
      line = word
      while (this.width(line, style) > maxWidth) {
        const chars = [...line]
        let n = chars.length - 1
        while (n > 1 && this.width(chars.slice(0, n).join(''), style) > maxWidth) n--
        lines.push(chars.slice(0, n).join(''))
        line = chars.slice(n).join('')
      }
    }
    if (line) lines.push(line)
    if (lines.length > maxLines) {
      const kept = lines.slice(0, maxLines)
      kept[maxLines - 1] = this.truncate(`${lines.slice(maxLines - 1).join(' ')}`, style, maxWidth)
      return kept
    }
    return lines
  }
}

/** Encodes each distinct string once per font: tables and repeated findings draw the same words many times. */
function memoiseEncoding(font: PDFFont) {
  const encode = font.encodeText.bind(font)
  const memo = new Map<string, ReturnType<PDFFont['encodeText']>>()
  font.encodeText = (text: string) => {
    let hex = memo.get(text)
    if (!hex) memo.set(text, hex = encode(text))
    return hex
  }
}

/** Page furniture and a cursor that moves down the page and onto a new one when a block will not fit. */
class Flow {
  readonly pages: PDFPage[] = []
  page!: PDFPage
  y = 0
  readonly left: number
  readonly right: number
  readonly top: number
  readonly bottom: number
  readonly width: number

  constructor(private readonly doc: PDFDocument, private readonly size: readonly [number, number], private readonly header: (page: PDFPage, f: Flow) => number) {
    this.left = 50
    this.right = size[0] - 50
    this.top = size[1] - 46
    this.bottom = 58
    this.width = this.right - this.left
  }

  newPage(withHeader = true) {
    this.page = this.doc.addPage([this.size[0], this.size[1]])
    this.pages.push(this.page)
    this.y = withHeader ? this.header(this.page, this) : this.size[1]
  }

  get room() { return this.y - this.bottom }
  /** The height a block may use on an empty page, under the running header. */
  get fullPage() { return this.top - 30 - this.bottom }

  /** Moves to a new page unless `height` fits below the cursor; true when it did. */
  ensure(height: number): boolean {
    if (height <= this.room) return false
    this.newPage()
    return true
  }
}

const tableColumns = [
  { key: 'ref', title: 'Covering', share: 58 },
  { key: 'room', title: 'Room', share: 78 },
  { key: 'product', title: 'Product', share: 50 },
  { key: 'control', title: 'Control', share: 54 },
  { key: 'size', title: 'Size W × D mm', share: 64 },
  { key: 'verdict', title: 'Verdict', share: 85 },
  { key: 'inspected', title: 'Last inspection', share: 106 },
] as const

/** Replaces every string in the data with one the embedded fonts can draw, and says whether Latin Extended is needed. */
function cleanStrings<T>(value: T, coverage: Coverage, seen: { ext: boolean }): T {
  if (typeof value === 'string') {
    const text = drawable(value, coverage)
    if (!seen.ext && needsExt(text, coverage)) seen.ext = true
    return text as T
  }
  if (Array.isArray(value)) return value.map(v => cleanStrings(v, coverage, seen)) as T
  if (value && typeof value === 'object') {
    const out: Record<string, unknown> = {}
    for (const [k, v] of Object.entries(value)) out[k] = k === 'thumbKey' ? v : cleanStrings(v, coverage, seen)
    return out as T
  }
  return value
}

/**
 * Draws the report: cover with summary, per-unit tables, a detail block for each non-compliant covering with
 * its photos, then scope, caution and sign-off. Pure: everything it shows comes in through its arguments.
 */
export function renderSiteReport(source: SiteReportData, thumbnails: Map<number, Uint8Array>): Promise<Uint8Array> {
  return drawReport(source, Promise.resolve(thumbnails))
}

/**
 * The drawing behind renderSiteReport. Thumbnails may still be on their way: they are first needed for the
 * detail pages, so the cover and the tables are drawn meanwhile, yielding now and then so downloads proceed.
 */
async function drawReport(source: SiteReportData, thumbnails: Promise<Map<number, Uint8Array>>): Promise<Uint8Array> {
  const coverage = await fontCoverage()
  const seen = { ext: false }
  const data = cleanStrings(source, coverage, seen)
  const doc = await PDFDocument.create()
  const title = `Cord-safety report: ${data.site.name} (${data.site.ref})`
  doc.setTitle(title)
  doc.setAuthor(data.business.name)
  doc.setCreator(PRODUCT_NAME)
  doc.setProducer(PRODUCT_NAME)
  doc.setSubject(`Window covering cord-safety report for ${data.client.name}, ${formatDay(data.generatedOn, true)}`)
  doc.setLanguage('en')
  const faces = await embedPublicSans(doc, seen.ext)
  const pen = new Pen(faces, coverage, await fontMetrics())

  const runningHeader = (page: PDFPage, f: Flow) => {
    const y = f.top
    pen.draw(page, pen.truncate(`${data.site.name} (${data.site.ref})`, { size: 8.5, weight: 'bold' }, f.width * 0.55), f.left, y, { size: 8.5, weight: 'bold', color: c.spruce })
    pen.drawRight(page, pen.truncate(`Cord-safety report for ${data.client.name}`, { size: 8.5 }, f.width * 0.42), f.right, y, { size: 8.5, color: c.stone })
    page.drawRectangle({ x: f.left, y: y - 9, width: f.width, height: 1.2, color: c.spruce })
    return y - 30
  }
  const flow = new Flow(doc, pageSizes[pageSizeFor(data.site.jurisdiction)], runningHeader)

  const contents = drawCover(flow, pen, data)
  const tablesPage = await drawUnitTables(flow, pen, data)

  const stored = await thumbnails
  const images = new Map<number, PDFImage | null>()
  for (const failure of data.failures) {
    for (const photo of failure.photos) {
      const bytes = stored.get(photo.id)
      // A thumbnail that will not decode is drawn as unavailable rather than losing the report.
      images.set(photo.id, bytes ? await doc.embedJpg(bytes).catch(() => null) : null)
    }
  }
  const auditPage = drawAuditAndRemovals(flow, pen, data)
  const detailsPage = drawFailures(flow, pen, data, images)
  const closingPage = drawClosing(flow, pen, data)
  contents([
    ['Coverings by unit', tablesPage],
    ['Latest audit and removals', auditPage],
    ['Non-compliant coverings in detail', detailsPage],
    ['Scope, caution and sign-off', closingPage],
  ])

  const total = flow.pages.length
  flow.pages.forEach((page, i) => {
    const y = 30
    page.drawRectangle({ x: flow.left, y: y + 13, width: flow.width, height: 0.6, color: c.line })
    const left = `${PRODUCT_NAME} supports judgement; it does not certify. Local codes, licensed practice and product instructions prevail.`
    pen.draw(page, pen.truncate(left, { size: 7 }, flow.width - 80), flow.left, y, { size: 7, color: c.stone })
    pen.drawRight(page, `Page ${i + 1} of ${total}`, flow.right, y, { size: 8, weight: 'bold', color: c.spruce })
  })
  return doc.save()
}

// ---------------------------------------------------------------------------------------------
// Cover.

function drawCover(flow: Flow, pen: Pen, data: SiteReportData): (entries: Array<[string, number | null]>) => void {
  flow.newPage(false)
  const page = flow.page
  const [pageWidth, pageHeight] = [page.getWidth(), page.getHeight()]
  const { left, right, width } = flow

  // The band: what this is, for which site, on which day.
  const bandHeight = 150
  page.drawRectangle({ x: 0, y: pageHeight - bandHeight, width: pageWidth, height: bandHeight, color: c.spruce })
  page.drawRectangle({ x: 0, y: pageHeight - bandHeight - 5, width: pageWidth, height: 5, color: c.spruceMid })
  let y = pageHeight - 44
  pen.draw(page, 'WINDOW COVERING CORD-SAFETY REPORT', left, y, { size: 8.5, weight: 'bold', color: c.spruceOnDark })
  pen.drawRight(page, formatDay(data.generatedOn, true), right, y, { size: 9, weight: 'bold', color: c.white })
  y -= 40
  const nameLines = pen.wrap(data.site.name, { size: 26, weight: 'bold' }, width, 2)
  const nameSize = nameLines.length > 1 ? 21 : 26
  for (const line of pen.wrap(data.site.name, { size: nameSize, weight: 'bold' }, width, 2)) {
    pen.draw(page, line, left, y, { size: nameSize, weight: 'bold', color: c.white })
    y -= nameSize * 1.15
  }
  y -= 2
  pen.draw(page, pen.truncate(`${data.site.ref}  ·  ${data.site.address}`, { size: 10.5 }, width), left, y, { size: 10.5, color: c.spruceOnDark })

  // Who it is for and who prepared it, side by side.
  y = pageHeight - bandHeight - 36
  const half = (width - 24) / 2
  const party = (x: number, label: string, lines: Array<string | null>) => {
    let py = y
    pen.draw(page, label.toUpperCase(), x, py, { size: 7.5, weight: 'bold', color: c.stone })
    py -= 17
    const [first, ...rest] = lines.filter((l): l is string => Boolean(l))
    for (const line of first ? pen.wrap(first, { size: 12.5, weight: 'bold' }, half, 2) : []) {
      pen.draw(page, line, x, py, { size: 12.5, weight: 'bold', color: c.ink })
      py -= 15
    }
    for (const line of rest) {
      pen.draw(page, pen.truncate(line, { size: 9 }, half), x, py, { size: 9, color: c.ink })
      py -= 12.5
    }
    return py
  }
  const b = data.business
  const forEnd = party(left, 'Prepared for', [data.client.name, data.client.contactName ? `Attention: ${data.client.contactName}` : null, data.client.reportEmail])
  const byEnd = party(left + half + 24, 'Prepared by', [b.name, [b.phone, b.email].filter(Boolean).join('  ·  ') || null, b.licenceNumber ? `Licence ${b.licenceNumber}` : null])
  y = Math.min(forEnd, byEnd) - 10

  // Key facts on a warm panel.
  const setName = data.ruleSets.map(s => s.name).filter((n, i, all) => all.indexOf(n) === i).join(', ')
  const facts: Array<[string, string]> = [
    ['Site reference', data.site.ref],
    ['Premises', premisesWords[data.site.premises] ?? sentence(data.site.premises)],
    ['Rule set', setName || data.site.jurisdiction],
    ['Coverings in place', String(data.summary.total)],
    ['Report date', formatDay(data.generatedOn)],
  ]
  const factsHeight = 42
  page.drawRectangle({ x: left, y: y - factsHeight, width, height: factsHeight, color: c.sand })
  const factWidth = width / facts.length
  facts.forEach(([label, value], i) => {
    const x = left + 12 + i * factWidth
    pen.draw(page, label, x, y - 16, { size: 7.5, color: c.stone })
    pen.draw(page, pen.truncate(value, { size: 10, weight: 'bold' }, factWidth - 16), x, y - 31, { size: 10, weight: 'bold', color: c.ink })
  })
  y -= factsHeight + 28

  // Summary: a tile per verdict, a bar of their shares, then the remedies.
  y = sectionTitle(page, pen, 'Summary', left, y)
  const gap = 8
  const tileWidth = (width - gap * 4) / 5
  const tileHeight = 54
  verdictOrder.forEach((v, i) => {
    const x = left + i * (tileWidth + gap)
    page.drawRectangle({ x, y: y - tileHeight, width: tileWidth, height: tileHeight, color: c.paper, borderColor: c.line, borderWidth: 0.6 })
    page.drawRectangle({ x, y: y - 3, width: tileWidth, height: 3, color: verdictColours[v] })
    pen.draw(page, String(data.summary[v]), x + 10, y - 30, { size: 22, weight: 'bold', color: data.summary[v] ? verdictColours[v] : c.stone })
    pen.draw(page, pen.truncate(verdictWords[v], { size: 8.5, weight: 'bold' }, tileWidth - 16), x + 10, y - 44, { size: 8.5, weight: 'bold', color: c.ink })
  })
  y -= tileHeight + 12
  if (data.summary.total > 0) {
    let x = left
    for (const v of verdictOrder) {
      const w = width * data.summary[v] / data.summary.total
      if (w > 0) page.drawRectangle({ x, y: y - 7, width: w, height: 7, color: verdictColours[v] })
      x += w
    }
    y -= 20
  }
  const { openRemedies, overdueRemedies } = data.summary
  const remedyTile = (x: number, label: string, n: number, note: string, alarm: boolean) => {
    const w = (width - gap) / 2
    page.drawRectangle({ x, y: y - 40, width: w, height: 40, color: alarm ? failTint : c.paper, borderColor: c.line, borderWidth: 0.6 })
    pen.draw(page, String(n), x + 12, y - 27, { size: 18, weight: 'bold', color: alarm ? verdictColours.non_compliant : c.spruce })
    const nx = x + 22 + pen.width(String(n), { size: 18, weight: 'bold' })
    pen.draw(page, label, nx, y - 18, { size: 9, weight: 'bold', color: c.ink })
    pen.draw(page, pen.truncate(note, { size: 8 }, w - (nx - x) - 8), nx, y - 30, { size: 8, color: c.stone })
  }
  remedyTile(left, 'Open remedies', openRemedies, 'Raised by failed clauses and not yet closed', false)
  remedyTile(left + (width + gap) / 2, 'Overdue remedies', overdueRemedies, overdueRemedies ? 'Past their due date: act on these first' : 'None past its due date', overdueRemedies > 0)
  y -= 40 + 24

  // Rule sets: which versions produced the verdicts.
  y = sectionTitle(page, pen, 'Rule sets applied', left, y)
  for (const s of data.ruleSets) {
    page.drawRectangle({ x: left, y: y - 19, width, height: 19, color: c.paper })
    pen.draw(page, s.name, left + 8, y - 13, { size: 9, weight: 'bold' })
    pen.draw(page, s.version, left + 170, y - 13, { size: 9 })
    pen.draw(page, s.current ? 'current version' : 'earlier version', left + 285, y - 13, { size: 8.5, color: s.current ? c.stone : verdictColours.incomplete })
    pen.drawRight(page, s.coverings === 1 ? '1 covering' : `${s.coverings} coverings`, right - 8, y - 13, { size: 9 })
    y -= 21
  }
  y -= 6
  const versionsNote = 'Each verdict is that of the covering\'s latest inspection, under the rule set version it was checked with.'
  for (const line of pen.wrap(versionsNote, { size: 8 }, width)) {
    pen.draw(page, line, left, y - 8, { size: 8, color: c.stone })
    y -= 11
  }
  y -= 14

  // Caution, in a panel with a spruce edge.
  const cautionLines = pen.wrap(REPORT_CAUTION, { size: 8.5 }, width - 30)
  const hazardLines = pen.wrap(REPORT_HAZARD, { size: 8.5, weight: 'bold' }, width - 30)
  const boxHeight = 28 + (cautionLines.length + hazardLines.length) * 11.5 + 4
  page.drawRectangle({ x: left, y: y - boxHeight, width, height: boxHeight, color: c.spruceTint })
  page.drawRectangle({ x: left, y: y - boxHeight, width: 3, height: boxHeight, color: c.spruce })
  let cy = y - 16
  pen.draw(page, 'Scope and caution', left + 15, cy, { size: 9.5, weight: 'bold', color: c.spruce })
  cy -= 14
  for (const line of hazardLines) {
    pen.draw(page, line, left + 15, cy, { size: 8.5, weight: 'bold', color: c.ink })
    cy -= 11.5
  }
  for (const line of cautionLines) {
    pen.draw(page, line, left + 15, cy, { size: 8.5, color: c.ink })
    cy -= 11.5
  }
  y -= boxHeight + 20

  // Contents, filled in once the later pages are laid out.
  const contentsY = y
  return (entries) => {
    if (contentsY - 28 - entries.length * 15 < flow.bottom) return
    let ty = sectionTitle(page, pen, 'In this report', left, contentsY)
    for (const [label, at] of entries) {
      if (at === null) continue
      pen.draw(page, label, left, ty - 10, { size: 9 })
      const pageText = `page ${at}`
      const textEnd = left + pen.width(label, { size: 9 }) + 6
      const numberStart = right - pen.width(pageText, { size: 9, weight: 'bold' }) - 6
      if (numberStart > textEnd) page.drawLine({ start: { x: textEnd, y: ty - 10 }, end: { x: numberStart, y: ty - 10 }, thickness: 0.5, color: c.line, dashArray: [1, 2] })
      pen.drawRight(page, pageText, right, ty - 10, { size: 9, weight: 'bold', color: c.spruce })
      ty -= 15
    }
  }
}

function sectionTitle(page: PDFPage, pen: Pen, text: string, x: number, y: number, size = 12.5): number {
  pen.draw(page, text, x, y - size, { size, weight: 'bold', color: c.spruce })
  return y - size - (size > 14 ? 18 : 13)
}

// ---------------------------------------------------------------------------------------------
// Per-unit tables.

async function drawUnitTables(flow: Flow, pen: Pen, data: SiteReportData): Promise<number> {
  flow.newPage()
  const first = flow.pages.length
  const scale = flow.width / tableColumns.reduce((s, col) => s + col.share, 0)
  const cols = tableColumns.map(col => ({ ...col, width: col.share * scale }))
  const cell = { size: 8.5 }
  const pad = 5
  const lineHeight = 10.5

  flow.y = sectionTitle(flow.page, pen, 'Coverings by unit', flow.left, flow.y, 16)
  for (const line of pen.wrap('Every covering in place at the site, with the verdict of its latest inspection. Sizes are width × drop in millimetres.', { size: 9 }, flow.width)) {
    pen.draw(flow.page, line, flow.left, flow.y, { size: 9, color: c.stone })
    flow.y -= 12
  }
  flow.y -= 10
  if (!data.units.length) {
    pen.draw(flow.page, 'No coverings are recorded in place at this site.', flow.left, flow.y - 10, { size: 10 })
    flow.y -= 30
    return first
  }

  const headerHeight = 18
  const unitBarHeight = 22
  const drawHeaderRow = () => {
    const page = flow.page
    page.drawRectangle({ x: flow.left, y: flow.y - headerHeight, width: flow.width, height: headerHeight, color: c.sand })
    let x = flow.left
    for (const col of cols) {
      pen.draw(page, pen.truncate(col.title, { size: 7.5, weight: 'bold' }, col.width - 2 * pad), x + pad, flow.y - 12, { size: 7.5, weight: 'bold', color: c.stone })
      x += col.width
    }
    flow.y -= headerHeight
  }
  const drawUnitBar = (unit: ReportUnit, continued: boolean) => {
    const page = flow.page
    page.drawRectangle({ x: flow.left, y: flow.y - unitBarHeight, width: flow.width, height: unitBarHeight, color: c.spruce })
    const name = [unit.ref, unit.name, unit.floor ? `${unit.floor} floor` : null].filter(Boolean).join('  ·  ') + (continued ? '  (continued)' : '')
    const failing = unit.coverings.filter(cv => cv.verdict === 'non_compliant').length
    const count = `${unit.coverings.length} ${unit.coverings.length === 1 ? 'covering' : 'coverings'}${failing ? `  ·  ${failing} non-compliant` : ''}`
    const countWidth = pen.width(count, { size: 8.5 })
    pen.draw(page, pen.truncate(name, { size: 10, weight: 'bold' }, flow.width - countWidth - 30), flow.left + 8, flow.y - 15, { size: 10, weight: 'bold', color: c.white })
    pen.drawRight(page, count, flow.right - 8, flow.y - 15, { size: 8.5, color: c.spruceOnDark })
    flow.y -= unitBarHeight
  }

  let rowsSinceYield = 0
  for (const unit of data.units) {
    // Let the thumbnail downloads move on between units; a yield costs microseconds.
    if ((rowsSinceYield += unit.coverings.length) >= 40) {
      rowsSinceYield = 0
      await new Promise(resolve => setImmediate(resolve))
    }
    // Lay each row out first, so a row is never split and the unit's heading never sits alone.
    const rows = unit.coverings.map((cv) => {
      const refLines = pen.wrap(cv.ref, { size: 8.5, weight: 'bold' }, cols[0]!.width - 2 * pad, 3)
      const room = pen.wrap(cv.childrensRoom ? `${cv.room} (child's room)` : cv.room, cell, cols[1]!.width - 2 * pad, 3)
      const productLines = pen.wrap(product(cv.productType), cell, cols[2]!.width - 2 * pad, 2)
      const controlLines = pen.wrap(control(cv.control), cell, cols[3]!.width - 2 * pad, 2)
      const audit = cv.auditOutcome ? auditWords[cv.auditOutcome] : null
      // A confirmation re-dates nothing: who measured, and when, stays in the row beside the confirmation.
      const measured = cv.confirmedOn && cv.measuredOn
        ? pen.wrap(`Measured ${formatDay(cv.measuredOn)}${cv.measuredBy ? ` by ${cv.measuredBy}` : ''}`, { size: 7.5 }, cols[6]!.width - 2 * pad, 2)
        : []
      const lines = Math.max(refLines.length, room.length, productLines.length, controlLines.length, 1 + (audit ? 1 : 0) + measured.length)
      return { cv, refLines, room, productLines, controlLines, audit, measured, height: lines * lineHeight + 2 * pad + 1 }
    })
    flow.y -= 6
    flow.ensure(unitBarHeight + headerHeight + (rows[0]?.height ?? 0))
    drawUnitBar(unit, false)
    drawHeaderRow()
    rows.forEach((row, i) => {
      if (flow.ensure(row.height)) {
        drawUnitBar(unit, true)
        drawHeaderRow()
      }
      const page = flow.page
      const top = flow.y
      if (i % 2 === 1) page.drawRectangle({ x: flow.left, y: top - row.height, width: flow.width, height: row.height, color: c.paper })
      page.drawRectangle({ x: flow.left, y: top - row.height, width: flow.width, height: 0.5, color: c.line })
      const base = top - pad - 7.5
      let x = flow.left
      const col = (n: number) => {
        const at = x
        x += cols[n]!.width
        return at + pad
      }
      const cv = row.cv
      const refX = col(0)
      row.refLines.forEach((l, n) => pen.draw(page, l, refX, base - n * lineHeight, { size: 8.5, weight: 'bold' }))
      const roomX = col(1)
      row.room.forEach((l, n) => pen.draw(page, l, roomX, base - n * lineHeight, cell))
      const productX = col(2)
      row.productLines.forEach((l, n) => pen.draw(page, l, productX, base - n * lineHeight, cell))
      const controlX = col(3)
      row.controlLines.forEach((l, n) => pen.draw(page, l, controlX, base - n * lineHeight, cell))
      pen.draw(page, sizeMm(cv.widthMm, cv.dropMm), col(4), base, cell)
      const verdictX = col(5)
      page.drawCircle({ x: verdictX + 3, y: base + 3, size: 3, color: verdictColours[cv.verdict] })
      const strong = cv.verdict === 'non_compliant'
      pen.draw(page, pen.truncate(verdictWords[cv.verdict], { size: 8.5, weight: strong ? 'bold' : 'regular' }, cols[5]!.width - 2 * pad - 10), verdictX + 10, base,
        { size: 8.5, weight: strong ? 'bold' : 'regular', color: strong ? verdictColours.non_compliant : c.ink })
      const inspectedX = col(6)
      const day = formatDay(cv.inspectedOn)
      pen.draw(page, day, inspectedX, base, cell)
      if (cv.inspectedOn && cv.inspectionKind) {
        const kindX = inspectedX + pen.width(day, cell) + 5
        const kind = pen.truncate(kindWords[cv.inspectionKind] ?? sentence(cv.inspectionKind), { size: 7.5 }, inspectedX + cols[6]!.width - 2 * pad - kindX)
        pen.draw(page, kind, kindX, base, { size: 7.5, color: c.stone })
      }
      if (row.audit) {
        const notSeen = cv.auditOutcome === 'not_accessible'
        pen.draw(page, pen.truncate(row.audit, { size: 7.5, weight: notSeen ? 'bold' : 'regular' }, cols[6]!.width - 2 * pad), inspectedX, base - lineHeight,
          { size: 7.5, weight: notSeen ? 'bold' : 'regular', color: notSeen ? verdictColours.incomplete : c.stone })
      }
      row.measured.forEach((l, n) => pen.draw(page, l, inspectedX, base - ((row.audit ? 2 : 1) + n) * lineHeight, { size: 7.5, color: c.stone }))
      flow.y -= row.height
    })
    flow.y -= 8
  }
  return first
}

// ---------------------------------------------------------------------------------------------
// The latest audit's outcome (what it measured, confirmed, and could not reach, and why) and the coverings
// removed since the last report, so none leaves the landlord's view unexplained.

function drawAuditAndRemovals(flow: Flow, pen: Pen, data: SiteReportData): number {
  const text = { size: 9 }
  const bullet = (lines: string[], bold = false) => {
    flow.ensure(lines.length * 12 + 4)
    flow.page.drawCircle({ x: flow.left + 4, y: flow.y + 3, size: 1.6, color: c.stone })
    lines.forEach((line, n) => pen.draw(flow.page, line, flow.left + 12, flow.y - n * 12, { size: 9, weight: bold && n === 0 ? 'bold' : 'regular' }))
    flow.y -= lines.length * 12 + 4
  }
  flow.ensure(120)
  flow.y -= 10
  const first = flow.pages.length
  flow.y = sectionTitle(flow.page, pen, 'Latest audit and removals', flow.left, flow.y, 14)
  const a = data.audit
  const summary = a
    ? `The latest site audit, closed ${formatDay(a.closedOn, true)}${a.officerName ? ` by ${a.officerName}` : ''}: ${a.measured} ${a.measured === 1 ? 'covering' : 'coverings'} re-measured, ${a.confirmed} confirmed unchanged against an earlier measurement (whose date and measurer are shown with each covering), and ${a.notAccessible.length} not accessible.`
    : 'No site audit has been closed in the register. Each covering\'s verdict rests on its latest inspection, shown in the table above.'
  for (const line of pen.wrap(summary, text, flow.width)) {
    flow.ensure(14)
    pen.draw(flow.page, line, flow.left, flow.y, text)
    flow.y -= 12
  }
  flow.y -= 6
  if (a?.notAccessible.length) {
    flow.ensure(40)
    pen.draw(flow.page, 'Not accessible at the audit: not checked then, their verdict is from an earlier inspection', flow.left, flow.y, { size: 9.5, weight: 'bold', color: verdictColours.incomplete })
    flow.y -= 15
    for (const n of a.notAccessible) bullet(pen.wrap(`${n.ref} (Unit ${n.unitRef}, ${n.room}): ${n.reason}`, text, flow.width - 12))
    flow.y -= 6
  }
  flow.ensure(40)
  const since = data.removalsSince ? `since the last report (${formatDay(data.removalsSince, true)})` : 'in the register (no report has been sent before)'
  pen.draw(flow.page, `Removed ${since}`, flow.left, flow.y, { size: 9.5, weight: 'bold', color: c.spruce })
  flow.y -= 15
  if (!data.removals.length) {
    pen.draw(flow.page, 'No covering was removed.', flow.left, flow.y, text)
    flow.y -= 16
  }
  for (const r of data.removals) {
    const head = `${r.ref} (Unit ${r.unitRef}, ${r.room}), removed ${formatDay(r.removedOn)}${r.removedBy ? ` by ${r.removedBy}` : ''}; last verdict ${verdictWords[r.lastVerdict].toLowerCase()}${r.replacedByRef ? `; replaced by ${r.replacedByRef}` : ''}`
    bullet([...pen.wrap(head, text, flow.width - 12), ...pen.wrap(`Reason: ${r.reason}`, text, flow.width - 12)])
  }
  flow.y -= 8
  return first
}

// ---------------------------------------------------------------------------------------------
// Non-compliant coverings, one block each.

interface Laid { height: number, draw: (page: PDFPage, top: number) => void }

function layFinding(pen: Pen, f: ReportFinding, x: number, width: number): Laid {
  const inner = width - 14
  const titleStyle = { size: 9.5, weight: 'bold' as const }
  const titleLines = pen.wrap(f.title ?? f.clause, titleStyle, inner - 90)
  const message = pen.wrap(f.message, { size: 8.5 }, inner)
  const source = [...pen.wrap(`Source: ${f.source}`, { size: 8 }, inner), ...pen.wrap(`Basis: ${basisWords[f.basis] ?? sentence(f.basis)}`, { size: 8 }, inner)]
  const fix = f.fix ? pen.wrap(`Remedy: ${f.fix}`, { size: 8.5, weight: 'regular' }, inner) : []
  const due = f.remedy ? `Priority ${f.remedy.priority}  ·  due ${formatDay(f.remedy.dueOn)}${f.remedy.overdue ? '  ·  overdue' : ''}` : null
  const flag = [f.measured, f.limit].some(v => v === 'true' || v === 'false')
  const measuredText = `${flag ? 'Recorded' : 'Measured'}: ${f.verdict === 'fail' ? valueWithUnit(f.measured, f.unit) : 'not recorded'}`
  const limitText = `${flag ? 'Required' : 'Limit'}: ${valueWithUnit(f.limit, f.unit)}`
  const height = 8 + titleLines.length * 12 + 20 + message.length * 11 + 3 + (fix.length ? fix.length * 11 + 3 : 0) + (due ? 11 : 0)
    + source.length * 10 + 6
  return {
    height,
    draw(page, top) {
      const accent = f.verdict === 'fail' ? verdictColours.non_compliant : verdictColours.incomplete
      page.drawRectangle({ x, y: top - height + 4, width: 2.5, height: height - 6, color: accent })
      let y = top - 8 - 8
      const tx = x + 12
      titleLines.forEach((line, i) => pen.draw(page, line, tx, y - i * 12, { ...titleStyle, color: c.ink }))
      if (f.title) pen.drawRight(page, f.clause, x + width, y, { size: 7.5, color: c.stone })
      y -= titleLines.length * 12
      // Measured against limit, as two chips.
      const chip = (text: string, at: number, fill: Color, ink: Color) => {
        const w = pen.width(text, { size: 8.5, weight: 'bold' }) + 12
        page.drawRectangle({ x: at, y: y - 6, width: w, height: 15, color: fill })
        pen.draw(page, text, at + 6, y - 1.5, { size: 8.5, weight: 'bold', color: ink })
        return at + w + 6
      }
      const next = chip(measuredText, tx, f.verdict === 'fail' ? failTint : c.sand, f.verdict === 'fail' ? verdictColours.non_compliant : verdictColours.incomplete)
      chip(limitText, next, c.sand, c.ink)
      y -= 20
      for (const line of message) {
        pen.draw(page, line, tx, y, { size: 8.5 })
        y -= 11
      }
      y -= 3
      if (fix.length) {
        fix.forEach((line, i) => {
          if (i === 0 && line.startsWith('Remedy:')) {
            pen.draw(page, 'Remedy:', tx, y, { size: 8.5, weight: 'bold', color: c.spruce })
            pen.draw(page, line.slice('Remedy:'.length), tx + pen.width('Remedy:', { size: 8.5, weight: 'bold' }), y, { size: 8.5 })
          }
          else pen.draw(page, line, tx, y, { size: 8.5 })
          y -= 11
        })
        y -= 3
      }
      if (due) {
        pen.draw(page, due, tx, y, { size: 8, weight: 'bold', color: f.remedy?.overdue ? verdictColours.non_compliant : c.spruce })
        y -= 11
      }
      for (const line of source) {
        pen.draw(page, line, tx, y, { size: 8, color: c.stone })
        y -= 10
      }
    },
  }
}

function layPhotos(pen: Pen, failure: FailedCovering, images: Map<number, PDFImage | null>, x: number, width: number): Laid | null {
  if (!failure.photos.length) return null
  const perRow = 5
  const gap = 8
  const boxW = (width - gap * (perRow - 1)) / perRow
  const boxH = boxW * 0.75
  const captionH = 19
  const rows = Math.ceil(failure.photos.length / perRow)
  const more = failure.photoCount - failure.photos.length
  const height = rows * (boxH + captionH + 6) + (more > 0 ? 12 : 0) + 4
  return {
    height,
    draw(page, top) {
      failure.photos.forEach((photo, i) => {
        const bx = x + (i % perRow) * (boxW + gap)
        const by = top - Math.floor(i / perRow) * (boxH + captionH + 6) - boxH
        page.drawRectangle({ x: bx, y: by, width: boxW, height: boxH, color: c.sand })
        const image = images.get(photo.id)
        if (image) {
          const scale = Math.min(boxW / image.width, boxH / image.height)
          const w = image.width * scale
          const h = image.height * scale
          page.drawImage(image, { x: bx + (boxW - w) / 2, y: by + (boxH - h) / 2, width: w, height: h })
        }
        else {
          // HEIC originals keep no thumbnail; a missing one is named too, never silently dropped.
          const note = photo.thumbKey ? 'Preview not available' : 'No preview; original kept in the register'
          const lines = pen.wrap(note, { size: 7 }, boxW - 10, 3)
          lines.forEach((line, n) => pen.draw(page, line, bx + (boxW - pen.width(line, { size: 7 })) / 2, by + boxH / 2 + (lines.length / 2 - n - 0.8) * 9, { size: 7, color: c.stone }))
        }
        page.drawRectangle({ x: bx, y: by, width: boxW, height: boxH, borderColor: c.line, borderWidth: 0.5 })
        const kind = photoKindWords[photo.kind] ?? sentence(photo.kind)
        pen.draw(page, pen.truncate(kind, { size: 7, weight: 'bold' }, boxW), bx, by - 9, { size: 7, weight: 'bold', color: c.ink })
        pen.draw(page, pen.truncate(`${formatDay(photo.takenOn)}  ·  photo #${photo.id}`, { size: 7 }, boxW), bx, by - 17.5, { size: 7, color: c.stone })
      })
      if (more > 0) {
        const y = top - rows * (boxH + captionH + 6) - 4
        pen.draw(page, `${more} more ${more === 1 ? 'photo is' : 'photos are'} kept with this covering in the register.`, x, y, { size: 7.5, color: c.stone })
      }
    },
  }
}

function drawFailures(flow: Flow, pen: Pen, data: SiteReportData, images: Map<number, PDFImage | null>): number | null {
  if (!data.failures.length) {
    flow.ensure(60)
    flow.y = sectionTitle(flow.page, pen, 'Non-compliant coverings', flow.left, flow.y - 8, 14)
    pen.draw(flow.page, 'No covering in place was non-compliant at its latest inspection.', flow.left, flow.y, { size: 9.5 })
    flow.y -= 24
    return null
  }
  flow.newPage()
  const first = flow.pages.length
  flow.y = sectionTitle(flow.page, pen, 'Non-compliant coverings in detail', flow.left, flow.y, 16)
  const intro = 'Each covering below failed at least one requirement at its latest inspection. For every failed clause the measured value is set against the clause\'s limit, with the document and section it rests on, the basis of our reading, and the remedy to make.'
  for (const line of pen.wrap(intro, { size: 9 }, flow.width)) {
    pen.draw(flow.page, line, flow.left, flow.y, { size: 9, color: c.stone })
    flow.y -= 12
  }
  flow.y -= 8

  const x = flow.left
  const width = flow.width
  for (const failure of data.failures) {
    // The head: reference and place on top (the place drops to its own line when the reference is long), then what it is.
    const pill = verdictWords.non_compliant
    const pillW = pen.width(pill, { size: 8, weight: 'bold' }) + 14
    const where = `Unit ${failure.unitRef}  ·  ${failure.room}${failure.childrensRoom ? ' (child\'s room)' : ''}`
    // Who measured, and when, is kept apart from who later confirmed the measurements unchanged at an audit.
    const measured = `${kindWords[failure.inspectionKind ?? ''] && !failure.confirmedOn ? `${kindWords[failure.inspectionKind ?? '']}: measured` : 'Measured'} ${formatDay(failure.measuredOn)}${failure.measuredBy ? ` by ${failure.measuredBy}` : ''}`
    const inspected = !failure.inspectedOn
      ? 'Not inspected'
      : failure.confirmedOn
        ? `${measured}; confirmed unchanged at audit ${formatDay(failure.confirmedOn)}${failure.confirmedBy ? ` by ${failure.confirmedBy}` : ''}`
        : measured
    const meta = pen.wrap([`${product(failure.productType)}, ${control(failure.control).toLowerCase()}`, `${sizeMm(failure.widthMm, failure.dropMm)} mm`, inspected,
      failure.rulesVersion ? `rules ${failure.rulesVersion}` : null, failure.notAccessibleReason ? `not accessible at the latest audit: ${failure.notAccessibleReason}` : null]
      .filter(Boolean).join('   ·   '), { size: 8 }, width - 24, 4)
    const headingRoom = width - 24 - pillW - 12
    const refWidth = pen.width(`${failure.ref} (continued)`, { size: 11.5, weight: 'bold' })
    const whereBeside = refWidth + 10 + pen.width(where, { size: 9 }) <= headingRoom
    const headHeight = 25 + (whereBeside ? 0 : 13) + meta.length * 11 + 4
    const drawHead = (continued: boolean) => {
      const page = flow.page
      const top = flow.y
      page.drawRectangle({ x, y: top - headHeight, width, height: headHeight, color: c.spruceTint })
      page.drawRectangle({ x, y: top - headHeight, width: 3, height: headHeight, color: verdictColours.non_compliant })
      page.drawRectangle({ x: x + width - pillW - 8, y: top - 20, width: pillW, height: 14, color: verdictColours.non_compliant })
      pen.draw(page, pill, x + width - pillW - 1, top - 16, { size: 8, weight: 'bold', color: c.white })
      const heading = `${failure.ref}${continued ? ' (continued)' : ''}`
      pen.draw(page, pen.truncate(heading, { size: 11.5, weight: 'bold' }, headingRoom), x + 12, top - 17, { size: 11.5, weight: 'bold', color: c.spruce })
      let y = top - 17
      if (whereBeside) pen.draw(page, where, x + 22 + pen.width(heading, { size: 11.5, weight: 'bold' }), y, { size: 9, color: c.ink })
      else {
        y -= 13
        pen.draw(page, pen.truncate(where, { size: 9 }, width - 24), x + 12, y, { size: 9, color: c.ink })
      }
      for (const line of meta) {
        y -= 11
        pen.draw(page, line, x + 12, y - 2, { size: 8, color: c.stone })
      }
      flow.y -= headHeight + 8
    }

    const parts: Laid[] = []
    const photos = layPhotos(pen, failure, images, x + 12, width - 24)
    if (photos) parts.push(photos)
    const fails = failure.findings.filter(f => f.verdict === 'fail')
    const missing = failure.findings.filter(f => f.verdict === 'missing')
    for (const f of fails) parts.push(layFinding(pen, f, x + 12, width - 24))
    if (missing.length) parts.push(layMissing(pen, missing, x + 12, width - 24))
    const total = headHeight + 8 + parts.reduce((s, p) => s + p.height, 0) + 14

    // Keep the block together where it fits on a page; a longer one breaks only between its parts.
    if (total > flow.room && total <= flow.fullPage) flow.newPage()
    else flow.ensure(headHeight + 8 + (parts[0]?.height ?? 0))
    drawHead(false)
    for (const part of parts) {
      if (flow.ensure(part.height)) drawHead(true)
      part.draw(flow.page, flow.y)
      flow.y -= part.height
    }
    flow.y -= 14
  }
  return first
}

function layMissing(pen: Pen, missing: ReportFinding[], x: number, width: number): Laid {
  const items = missing.map(f => pen.wrap(`${f.title ?? f.clause} (${f.clause}): ${f.message}`, { size: 8 }, width - 24))
  const height = 8 + 12 + items.reduce((s, lines) => s + lines.length * 10 + 2, 0) + 6
  return {
    height,
    draw(page, top) {
      let y = top - 16
      pen.draw(page, 'Also to be measured before this covering can be judged in full', x + 12, y, { size: 8.5, weight: 'bold', color: verdictColours.incomplete })
      y -= 12
      for (const lines of items) {
        page.drawCircle({ x: x + 15, y: y + 3, size: 1.4, color: c.stone })
        for (const line of lines) {
          pen.draw(page, line, x + 22, y, { size: 8, color: c.ink })
          y -= 10
        }
        y -= 2
      }
    },
  }
}

// ---------------------------------------------------------------------------------------------
// Scope, caution and sign-off.

function drawClosing(flow: Flow, pen: Pen, data: SiteReportData): number {
  const scope = [
    `This report lists every window covering recorded as in place at ${data.site.name} on ${formatDay(data.generatedOn, true)}, with the verdict of its latest inspection as recorded in ${PRODUCT_NAME} by ${data.business.name}. A covering never inspected is shown as “${verdictWords.not_checked}”. “${verdictWords.incomplete}” means a measurement the rules need was not recorded; “${verdictWords.not_applicable}” means no requirement of the rule set applies to that covering (for example a cordless or motorised control).`,
    'A verdict reflects the measurements and observations made at that inspection. Cords, chains, tension devices and furniture can be moved or changed afterwards; the report does not describe the condition of any covering on a later day.',
    'The rulebook restates published requirements in our own words. Each failed clause above names the document and section it rests on and the basis of our reading, so that a qualified person can check it against the text in force.',
  ]
  const text = { size: 9 }
  const paragraphs = scope.map(p => pen.wrap(p, text, flow.width))
  const cautionLines = pen.wrap(REPORT_CAUTION, { size: 9 }, flow.width - 30)
  const hazardLines = pen.wrap(REPORT_HAZARD, { size: 9, weight: 'bold' }, flow.width - 30)
  const cautionHeight = 30 + (cautionLines.length + hazardLines.length) * 12 + 6
  const signHeight = 190
  const height = 40 + paragraphs.reduce((s, p) => s + p.length * 12 + 8, 0) + cautionHeight + 24 + signHeight
  // Scope, caution and signature stay on one page, so the signature always sits under the caution it accepts.
  if (height > flow.room) flow.newPage()
  else flow.y -= 16
  const page = flow.page
  const first = flow.pages.length
  const { left, right, width } = flow
  flow.y = sectionTitle(page, pen, 'Scope, caution and sign-off', left, flow.y, 16)
  for (const lines of paragraphs) {
    for (const line of lines) {
      pen.draw(page, line, left, flow.y, text)
      flow.y -= 12
    }
    flow.y -= 8
  }

  let y = flow.y - 4
  page.drawRectangle({ x: left, y: y - cautionHeight, width, height: cautionHeight, color: c.spruceTint })
  page.drawRectangle({ x: left, y: y - cautionHeight, width: 3, height: cautionHeight, color: c.spruce })
  let cy = y - 17
  pen.draw(page, 'Caution', left + 15, cy, { size: 10, weight: 'bold', color: c.spruce })
  cy -= 15
  for (const line of hazardLines) {
    pen.draw(page, line, left + 15, cy, { size: 9, weight: 'bold' })
    cy -= 12
  }
  for (const line of cautionLines) {
    pen.draw(page, line, left + 15, cy, { size: 9 })
    cy -= 12
  }
  y -= cautionHeight + 26

  // The officer's block: printed from the latest closed audit, or left blank to be completed by hand.
  pen.draw(page, 'OFFICER\'S SIGN-OFF', left, y, { size: 8, weight: 'bold', color: c.stone })
  y -= 8
  page.drawRectangle({ x: left, y: y - 150, width, height: 150, borderColor: c.line, borderWidth: 0.8, color: c.paper })
  const colW = (width - 48) / 2
  const field = (x: number, fy: number, label: string, value: string | null) => {
    if (value) pen.draw(page, pen.truncate(value, { size: 11, weight: 'bold' }, colW), x, fy + 5, { size: 11, weight: 'bold' })
    page.drawLine({ start: { x, y: fy }, end: { x: x + colW, y: fy }, thickness: 0.7, color: c.stone })
    pen.draw(page, label, x, fy - 11, { size: 7.5, color: c.stone })
  }
  const officer = data.signOff.officerName
  const closedOn = data.signOff.closedOn ? formatDay(data.signOff.closedOn, true) : null
  const intro = officer
    ? `The latest site audit was closed by ${officer} on ${closedOn}.`
    : 'No site audit has been closed in the register; complete the names and dates by hand.'
  pen.draw(page, pen.truncate(intro, { size: 8.5 }, width - 32), left + 16, y - 20, { size: 8.5, color: c.ink })
  field(left + 16, y - 62, 'Compliance officer', officer)
  field(left + 32 + colW, y - 62, 'Audit closed on', closedOn)
  field(left + 16, y - 118, 'Signature', null)
  field(left + 32 + colW, y - 118, 'Date signed', null)
  flow.y = y - 160
  pen.drawRight(page, `Report prepared ${formatDay(data.generatedOn, true)} for ${data.client.name}`, right, flow.y - 4, { size: 7.5, color: c.stone })
  return first
}
