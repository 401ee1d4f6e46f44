import { QueryTypes } from 'sequelize'
import type { Sequelize, Transaction } from 'sequelize'
import { checkRecord, parseCoveringRecord } from '../../rules'
import type { CheckResult, CoveringRecord, Finding } from '../../rules'
import { columnNameOf, hasMeasurements, measurementColumns, readRow } from '../../shared/schemas/imports'
import type { HeaderMap, ImportRow, RowProblem } from '../../shared/schemas/imports'
import type { ChangeCounts, ImportCounts, ImportRowError } from '../../shared/types/jobs'
import { daysToRemedy, remedyPriority } from './fixes'
import { rulebookInput } from './inspections'
import { copyIntoTransaction, copyText, pushColumns } from './pg-copy'
import type { CopyText } from './pg-copy'

// One import, batch by batch: read and check every row, look up what already exists, then write the
// good rows with a few multi-row statements per table. What the file says about a site, unit or opening
// is remembered by ref (not the rows themselves), so memory grows with the refs, not with the file.

type Kind = 'sites' | 'units' | 'openings' | 'coverings'
type Counted = 'created' | 'updated' | 'unchanged'

interface SiteState {
  id: number | null
  ref: string
  /**
   * The ref is taken by a site of another client in the workspace. Such a site is kept as if it did not exist
   * (no id, no values), so every answer about it reads as for a new ref; only creating it is refused.
   */
  foreign: boolean
  name: string | null
  address: string | null
  jurisdiction: string | null
  premises: string | null
  /** The row that last gave this site's values in this file (later rows must agree). */
  row: number | null
  counted: Counted | null
}
interface UnitState { id: number | null, siteRef: string, ref: string, name: string | null, row: number | null, counted: Counted | null }
interface OpeningState { id: number | null, unitKey: string, ref: string, room: string | null, childrensRoom: boolean | null, row: number | null, counted: Counted | null }
interface CoveringFound {
  id: number
  openingId: number
  productType: string
  control: string
  madeTo: string | null
  installedOn: string | null
  manufacturedOn: string | null
  lastInspectedAt: Date | null
  record: Record<string, unknown> | null
}
interface CoveringPlan {
  row: number
  site: SiteState
  opening: OpeningState
  ref: string
  found: CoveringFound | null
  changed: boolean
  values: { productType: string, control: string, madeTo: string | null, installedOn: string | null, manufacturedOn: string | null }
  id: number | null
  inspectionId: number | null
  inspection: { record: CoveringRecord, result: CheckResult, inspectedAt: Date } | null
}

const siteFields = [['site_name', 'name'], ['address', 'address'], ['jurisdiction', 'jurisdiction'], ['premises', 'premises']] as const
const coveringFields = [['product_type', 'productType'], ['control', 'control'], ['made_to', 'madeTo'], ['installed_on', 'installedOn'], ['manufactured_on', 'manufacturedOn']] as const
const recordFieldNames = new Map(measurementColumns.map(c => [c.field as string, c.name]))
// Not-applicable findings are shared between results (the engine caches them), so each is laid out for COPY once.
const findingTexts = new WeakMap<Finding, CopyText>()
function findingText(x: Finding) {
  let text = findingTexts.get(x)
  if (text === undefined) {
    text = copyText([x.clause, x.verdict, x.measured, x.limit, x.unit, x.field, x.source, x.basis, x.message, x.fix])
    findingTexts.set(x, text)
  }
  return text
}
/** The answer for a new site whose ref is already taken in the workspace (by a site this import may not see). */
const SITE_REF_UNAVAILABLE = (ref: string) => `${ref} cannot be used for a new site; choose another reference for it`
const emptyCounts = (): ChangeCounts => ({ created: 0, updated: 0, unchanged: 0 })

/** Rulebook messages name camelCase fields; the person reading them knows the template's columns. */
function inColumns(message: string) {
  return message.replace(/\b([a-z]+(?:[A-Z][a-z]*)+N?|[a-z]+Mm)\b/g, w => recordFieldNames.get(w) ?? (w === 'installedOn' || w === 'manufacturedOn' ? columnNameOf(w) : w))
}

export class ImportBatcher {
  readonly counts: ImportCounts = {
    rows: 0, goodRows: 0, badRows: 0, problems: 0, written: false,
    sites: emptyCounts(), units: emptyCounts(), openings: emptyCounts(), coverings: emptyCounts(), inspections: { created: 0, unchanged: 0 }, remediesRaised: 0,
  }

  private sites = new Map<string, SiteState>()
  private units = new Map<string, UnitState>()
  private openings = new Map<string, OpeningState>()
  /** Where each covering was first given, to catch a covering_ref given twice. */
  private coveringRows = new Map<string, number>()
  /** What this batch's good rows create or change, written at the end of the batch. */
  private pending = { sites: new Set<SiteState>(), units: new Set<UnitState>(), openings: new Set<OpeningState>() }

  constructor(private db: Sequelize, private header: HeaderMap, private job: { id: number, workspaceId: number, clientId: number, fileName: string },
    private onProblems: (problems: ImportRowError[]) => Promise<void>) {}

  async addBatch(records: Array<{ row: number, cells: string[] }>, transaction: Transaction) {
    const problems: ImportRowError[] = []
    const good: Array<{ row: number, data: ImportRow }> = []
    for (const { row, cells } of records) {
      const read = readRow(this.header, cells)
      if ('problems' in read) problems.push(...read.problems.map(p => ({ row, ...p })))
      else good.push({ row, data: read.row })
    }
    await this.lookUp(good.map(g => g.data), transaction)
    const coveringsFound = await this.findCoverings(good.map(g => g.data), transaction)
    const plans: CoveringPlan[] = []
    for (const { row, data } of good) {
      const rowProblems: RowProblem[] = []
      const plan = this.planRow(row, data, coveringsFound, rowProblems)
      if (rowProblems.length) problems.push(...rowProblems.map(p => ({ row, ...p })))
      else if (plan) plans.push(plan)
    }
    const badRows = new Set(problems.map(p => p.row))
    this.counts.rows += records.length
    this.counts.badRows += badRows.size
    this.counts.goodRows += records.length - badRows.size
    this.counts.problems += problems.length
    if (problems.length) await this.onProblems(problems.sort((a, b) => a.row - b.row))
    await this.write(plans, transaction)
  }

  /** Loads the sites, units and openings the batch names that this import has not met yet. */
  private async lookUp(rows: ImportRow[], transaction: Transaction) {
    const q = <T extends object>(sql: string, bind: unknown[]) => this.db.query<T>(sql, { type: QueryTypes.SELECT, bind, transaction })
    const newSites = [...new Set(rows.map(r => r.site_ref as string))].filter(ref => !this.sites.has(ref))
    if (newSites.length) {
      const found = await q<{ id: number, clientId: number, ref: string, name: string, address: string, jurisdiction: string, premises: string }>(
        `SELECT id, client_id AS "clientId", ref, name, address, jurisdiction, premises FROM sites WHERE workspace_id = $1 AND ref = ANY($2::text[])`, [this.job.workspaceId, newSites])
      const byRef = new Map(found.map(s => [s.ref, s]))
      for (const ref of newSites) {
        const s = byRef.get(ref)
        const own = s && s.clientId === this.job.clientId ? s : null
        this.sites.set(ref, own
          ? { id: own.id, ref, foreign: false, name: own.name, address: own.address, jurisdiction: own.jurisdiction, premises: own.premises, row: null, counted: null }
          : { id: null, ref, foreign: !!s, name: null, address: null, jurisdiction: null, premises: null, row: null, counted: null })
      }
    }
    const unitKeys = new Map<string, [number, string]>()
    for (const r of rows) {
      const site = this.sites.get(r.site_ref as string)!
      const key = `${r.site_ref}\t${r.unit_ref}`
      if (site.id && !site.foreign && !this.units.has(key)) unitKeys.set(key, [site.id, r.unit_ref as string])
    }
    if (unitKeys.size) {
      const found = await q<{ id: number, siteId: number, ref: string, name: string | null }>(`SELECT u.id, u.site_id AS "siteId", u.ref, u.name FROM units u
        JOIN unnest($1::int[], $2::text[]) k(site_id, ref) ON u.site_id = k.site_id AND u.ref = k.ref`, [[...unitKeys.values()].map(k => k[0]), [...unitKeys.values()].map(k => k[1])])
      const byKey = new Map(found.map(u => [`${u.siteId}\t${u.ref}`, u]))
      for (const [key, [siteId, ref]] of unitKeys) {
        const u = byKey.get(`${siteId}\t${ref}`)
        this.units.set(key, { id: u?.id ?? null, siteRef: key.split('\t')[0]!, ref, name: u?.name ?? null, row: null, counted: null })
      }
    }
    const openingKeys = new Map<string, [number, string]>()
    for (const r of rows) {
      if (r.opening_ref === null) continue
      const unit = this.units.get(`${r.site_ref}\t${r.unit_ref}`)
      const key = `${r.site_ref}\t${r.unit_ref}\t${r.opening_ref}`
      if (unit?.id && !this.openings.has(key)) openingKeys.set(key, [unit.id, r.opening_ref as string])
    }
    if (openingKeys.size) {
      const found = await q<{ id: number, unitId: number, ref: string, room: string, childrensRoom: boolean }>(`SELECT o.id, o.unit_id AS "unitId", o.ref, o.room,
          o.childrens_room AS "childrensRoom" FROM openings o JOIN unnest($1::int[], $2::text[]) k(unit_id, ref) ON o.unit_id = k.unit_id AND o.ref = k.ref`,
      [[...openingKeys.values()].map(k => k[0]), [...openingKeys.values()].map(k => k[1])])
      const byKey = new Map(found.map(o => [`${o.unitId}\t${o.ref}`, o]))
      for (const [key, [unitId, ref]] of openingKeys) {
        const o = byKey.get(`${unitId}\t${ref}`)
        this.openings.set(key, { id: o?.id ?? null, unitKey: key.split('\t').slice(0, 2).join('\t'), ref, room: o?.room ?? null, childrensRoom: o?.childrensRoom ?? null, row: null, counted: null })
      }
    }
  }

  private async findCoverings(rows: ImportRow[], transaction: Transaction) {
    const keys: Array<[number, string]> = []
    for (const r of rows) {
      const site = this.sites.get(r.site_ref as string)!
      if (r.covering_ref !== null && site.id && !site.foreign) keys.push([site.id, r.covering_ref as string])
    }
    if (!keys.length) return new Map<string, CoveringFound>()
    const found = await this.db.query<CoveringFound & { siteId: number, ref: string }>(`SELECT c.id, c.site_id AS "siteId", c.ref, c.opening_id AS "openingId",
        c.product_type AS "productType", c.control, c.made_to AS "madeTo", to_char(c.installed_on, 'YYYY-MM-DD') AS "installedOn",
        c.manufactured_on AS "manufacturedOn", c.last_inspected_at AS "lastInspectedAt", i.record
      FROM coverings c JOIN unnest($1::int[], $2::text[]) k(site_id, ref) ON c.site_id = k.site_id AND c.ref = k.ref
      LEFT JOIN inspections i ON i.id = c.last_inspection_id`, { type: QueryTypes.SELECT, bind: [keys.map(k => k[0]), keys.map(k => k[1])], transaction })
    return new Map(found.map(c => [`${c.siteId}\t${c.ref}`, c]))
  }

  /** Checks one row against what exists and what earlier rows said; only a row with no problem changes anything. */
  private planRow(row: number, r: ImportRow, coveringsFound: Map<string, CoveringFound>, problems: RowProblem[]): CoveringPlan | null {
    const siteRef = r.site_ref as string
    const site = this.sites.get(siteRef)!
    const siteChanges: Record<string, string> = {}
    for (const [column, key] of siteFields) {
      const v = r[column] as string | null
      if (v === null || v === site[key]) continue
      if (site.row !== null) problems.push({ column, message: `says “${v}”, but row ${site.row} gave “${site[key]}” for site ${siteRef}` })
      else if (site.id === null && site[key] !== null) problems.push({ column, message: `says “${v}”, but an earlier row gave “${site[key]}” for site ${siteRef}` })
      else siteChanges[key] = v
    }
    if (site.id === null) {
      for (const [column, key] of siteFields) {
        if (site[key] === null && siteChanges[key] === undefined) problems.push({ column, message: `is empty; it is needed to create site ${siteRef}` })
      }
      // Refs are unique in the workspace, so another client's ref cannot become a site of this client. The answer
      // says only that the ref cannot be used, never whose it is or what the site holds.
      if (site.foreign && siteFields.every(([, key]) => site[key] !== null || siteChanges[key] !== undefined)) {
        problems.push({ column: 'site_ref', message: SITE_REF_UNAVAILABLE(siteRef) })
      }
    }
    const unitKey = `${siteRef}\t${r.unit_ref}`
    const unit = this.units.get(unitKey) ?? { id: null, siteRef, ref: r.unit_ref as string, name: null, row: null, counted: null }
    let unitName: string | null = null
    if (r.unit_name !== null && r.unit_name !== unit.name) {
      if (unit.row !== null) problems.push({ column: 'unit_name', message: `says “${r.unit_name}”, but row ${unit.row} gave “${unit.name}” for unit ${r.unit_ref}` })
      else unitName = r.unit_name as string
    }
    let opening: OpeningState | null = null
    const openingChanges: { room?: string, childrensRoom?: boolean } = {}
    if (r.opening_ref !== null) {
      const key = `${unitKey}\t${r.opening_ref}`
      opening = this.openings.get(key) ?? { id: null, unitKey, ref: r.opening_ref as string, room: null, childrensRoom: null, row: null, counted: null }
      if (r.room !== null && r.room !== opening.room) {
        if (opening.row !== null) problems.push({ column: 'room', message: `says “${r.room}”, but row ${opening.row} gave “${opening.room}” for opening ${r.opening_ref}` })
        else openingChanges.room = r.room as string
      }
      if (r.childrens_room !== null && r.childrens_room !== opening.childrensRoom) {
        if (opening.row !== null && opening.childrensRoom !== null) problems.push({ column: 'childrens_room', message: `disagrees with row ${opening.row} for opening ${r.opening_ref}` })
        else openingChanges.childrensRoom = r.childrens_room as boolean
      }
      if (opening.id === null && opening.room === null && openingChanges.room === undefined) problems.push({ column: 'room', message: `is empty; it is needed to create opening ${r.opening_ref}` })
    }
    let plan: CoveringPlan | null = null
    if (r.covering_ref !== null && opening) {
      const ref = r.covering_ref as string
      const dupKey = `${siteRef}\t${ref}`
      const first = this.coveringRows.get(dupKey)
      if (first !== undefined) problems.push({ column: 'covering_ref', message: `${ref} is given twice at site ${siteRef} (first on row ${first}); each covering takes one row` })
      const found = site.id ? coveringsFound.get(`${site.id}\t${ref}`) ?? null : null
      const values = {
        productType: (r.product_type as string | null) ?? found?.productType ?? null, control: (r.control as string | null) ?? found?.control ?? null,
        madeTo: (r.made_to as string | null) ?? found?.madeTo ?? null, installedOn: (r.installed_on as string | null) ?? found?.installedOn ?? null,
        manufacturedOn: (r.manufactured_on as string | null) ?? found?.manufacturedOn ?? null,
      }
      if (!found && values.productType === null) problems.push({ column: 'product_type', message: `is empty; it is needed to create covering ${ref}` })
      if (!found && values.control === null) problems.push({ column: 'control', message: `is empty; it is needed to create covering ${ref}` })
      if (problems.length) return null
      const changed = !!found && (coveringFields.some(([column, key]) => r[column] !== null && r[column] !== found[key]) || (opening.id !== null && found.openingId !== opening.id) || opening.id === null)
      plan = { row, site, opening, ref, found, changed, values: values as CoveringPlan['values'], id: found?.id ?? null, inspectionId: null, inspection: null }
      const measurements: Record<string, unknown> = {}
      for (const c of measurementColumns) if (r[c.name] !== null && c.field !== 'childrensRoom') measurements[c.field!] = r[c.name]
      const childrensRoom = openingChanges.childrensRoom ?? opening.childrensRoom ?? false
      // The record sign-off would build (rules/build.ts, the room's flag from the register), parsed once.
      const parsed = parseCoveringRecord(rulebookInput(
        { jurisdiction: (siteChanges.jurisdiction ?? site.jurisdiction) as 'AU', premises: siteChanges.premises ?? site.premises! },
        { ref, ...values } as Parameters<typeof rulebookInput>[1], measurements, { childrensRoom }))
      if (!parsed.success) {
        for (const issue of parsed.error.issues) {
          const field = String(issue.path[0] ?? '')
          problems.push({ column: recordFieldNames.get(field) ?? columnNameOf(field), message: inColumns(issue.message) })
        }
        return null
      }
      if (hasMeasurements(r)) {
        const inspectedAt = new Date(`${r.measured_on as string}T00:00:00Z`)
        const sameDay = found?.lastInspectedAt && found.lastInspectedAt.toISOString().slice(0, 10) === r.measured_on
        const same = sameDay && found?.record && Object.entries(parsed.data).every(([k, v]) => (found.record![k] ?? null) === (v ?? null))
        if (same) this.counts.inspections.unchanged++
        else plan.inspection = { record: parsed.data, result: checkRecord(parsed.data, { today: r.measured_on as string }), inspectedAt }
      }
    }
    if (problems.length) return null
    this.commitRow(row, site, siteChanges, unit, unitKey, unitName, opening, openingChanges)
    if (plan) {
      this.coveringRows.set(`${siteRef}\t${plan.ref}`, row)
      this.count('coverings', plan.found ? (plan.changed ? 'updated' : 'unchanged') : 'created')
    }
    return plan
  }

  /** A good row's values become what this import knows of its site, unit and opening. */
  private commitRow(row: number, site: SiteState, siteChanges: Record<string, string>, unit: UnitState, unitKey: string, unitName: string | null,
    opening: OpeningState | null, openingChanges: { room?: string, childrensRoom?: boolean }) {
    const siteChanged = Object.keys(siteChanges).length > 0
    Object.assign(site, siteChanges)
    if (siteChanged) site.row = row
    site.counted = this.recount('sites', site.counted, site.id === null ? 'created' : siteChanged ? 'updated' : 'unchanged')
    if (site.id === null || siteChanged) this.pending.sites.add(site)
    if (unitName !== null) { unit.name = unitName; unit.row = row }
    unit.counted = this.recount('units', unit.counted, unit.id === null ? 'created' : unitName !== null ? 'updated' : 'unchanged')
    if (unit.id === null || unitName !== null) this.pending.units.add(unit)
    this.units.set(unitKey, unit)
    if (opening) {
      const changed = Object.keys(openingChanges).length > 0
      Object.assign(opening, openingChanges)
      if (changed) opening.row = row
      opening.counted = this.recount('openings', opening.counted, opening.id === null ? 'created' : changed ? 'updated' : 'unchanged')
      if (opening.id === null || changed) this.pending.openings.add(opening)
      this.openings.set(`${unitKey}\t${opening.ref}`, opening)
    }
  }

  /** Each record counts once: first as met, moved from unchanged to updated if a later row changes it. */
  private recount(kind: Kind, was: Counted | null, now: Counted): Counted {
    if (was === null) { this.count(kind, now); return now }
    if (was !== 'unchanged' || now !== 'updated') return was
    this.counts[kind].unchanged--
    this.count(kind, 'updated')
    return 'updated'
  }

  private count(kind: Kind, how: Counted) {
    this.counts[kind][how]++
  }

  private async write(plans: CoveringPlan[], transaction: Transaction) {
    const q = <T extends object>(sql: string, bind: unknown[]) => this.db.query<T>(sql, { type: QueryTypes.SELECT, bind, transaction })
    const copy = (table: string, columns: string[], rows: Iterable<readonly unknown[]>) => copyIntoTransaction(transaction, table, columns, rows)
    const ws = this.job.workspaceId
    // Only what a good row met is written; parents first, so children have their ids.
    const sites = [...this.pending.sites]
    const newSites = sites.filter(s => s.id === null)
    if (newSites.length) {
      const ids = await q<{ id: number, ref: string }>(`INSERT INTO sites (workspace_id, client_id, ref, name, address, jurisdiction, premises)
        SELECT $1, $2, * FROM unnest($3::text[], $4::text[], $5::text[], $6::text[], $7::text[]) RETURNING id, ref`,
      [ws, this.job.clientId, newSites.map(s => s.ref), newSites.map(s => s.name), newSites.map(s => s.address), newSites.map(s => s.jurisdiction), newSites.map(s => s.premises)])
      // Matched back by ref: RETURNING promises no order.
      const byRef = new Map(ids.map(r => [r.ref, r.id]))
      for (const s of newSites) s.id = byRef.get(s.ref)!
    }
    for (const s of sites.filter(s => !newSites.includes(s))) {
      await q(`UPDATE sites SET name = $2, address = $3, jurisdiction = $4, premises = $5, updated_at = now() WHERE id = $1`, [s.id, s.name, s.address, s.jurisdiction, s.premises])
    }
    const units = [...this.pending.units], openings = [...this.pending.openings]
    const newUnits = units.filter(u => u.id === null), newOpenings = openings.filter(o => o.id === null)
    const newCoverings = plans.filter(p => !p.found), measured = plans.filter(p => p.inspection)
    // One round trip reserves every id the batch needs, so the new rows can go in with COPY.
    const [reserved] = await q<Record<'units' | 'openings' | 'coverings' | 'inspections', number[]>>(`SELECT
        ARRAY(SELECT nextval(pg_get_serial_sequence('units', 'id'))::int FROM generate_series(1, $1)) AS units,
        ARRAY(SELECT nextval(pg_get_serial_sequence('openings', 'id'))::int FROM generate_series(1, $2)) AS openings,
        ARRAY(SELECT nextval(pg_get_serial_sequence('coverings', 'id'))::int FROM generate_series(1, $3)) AS coverings,
        ARRAY(SELECT nextval(pg_get_serial_sequence('inspections', 'id'))::int FROM generate_series(1, $4)) AS inspections`,
    [newUnits.length, newOpenings.length, newCoverings.length, measured.length])
    newUnits.forEach((u, i) => { u.id = reserved!.units[i]! })
    newOpenings.forEach((o, i) => { o.id = reserved!.openings[i]! })
    newCoverings.forEach((p, i) => { p.id = reserved!.coverings[i]! })
    measured.forEach((p, i) => { p.inspectionId = reserved!.inspections[i]! })
    const siteOf = (siteRef: string) => this.sites.get(siteRef)!.id
    await copy('units', ['id', 'site_id', 'ref', 'name'], newUnits.map(u => [u.id, siteOf(u.siteRef), u.ref, u.name]))
    const changedUnits = units.filter(u => !newUnits.includes(u))
    if (changedUnits.length) {
      await q(`UPDATE units u SET name = k.name, updated_at = now() FROM unnest($1::int[], $2::text[]) k(id, name) WHERE u.id = k.id`, [changedUnits.map(u => u.id), changedUnits.map(u => u.name)])
    }
    const unitOf = (o: OpeningState) => this.units.get(o.unitKey)!
    await copy('openings', ['id', 'site_id', 'unit_id', 'ref', 'room', 'childrens_room'], newOpenings.map(o => [o.id, siteOf(unitOf(o).siteRef), unitOf(o).id, o.ref, o.room, o.childrensRoom ?? false]))
    const changedOpenings = openings.filter(o => !newOpenings.includes(o))
    if (changedOpenings.length) {
      await q(`UPDATE openings o SET room = k.room, childrens_room = COALESCE(k.childrens, o.childrens_room), updated_at = now()
        FROM unnest($1::int[], $2::text[], $3::boolean[]) k(id, room, childrens) WHERE o.id = k.id`,
      [changedOpenings.map(o => o.id), changedOpenings.map(o => o.room), changedOpenings.map(o => o.childrensRoom)])
    }
    this.pending = { sites: new Set(), units: new Set(), openings: new Set() }
    // A new covering points at its imported inspection straight away; the key is checked at commit (deferred).
    await copy('coverings', ['id', 'site_id', 'opening_id', 'ref', 'product_type', 'control', 'made_to', 'installed_on', 'manufactured_on', 'last_inspection_id', 'last_verdict', 'last_inspected_at'],
      newCoverings.map(p => [p.id, p.site.id, p.opening.id, p.ref, p.values.productType, p.values.control, p.values.madeTo, p.values.installedOn, p.values.manufacturedOn,
        p.inspectionId, p.inspection?.result.verdict ?? null, p.inspection?.inspectedAt ?? null]))
    const changed = plans.filter(p => p.found && p.changed)
    if (changed.length) {
      await q(`UPDATE coverings c SET opening_id = k.opening_id, product_type = k.product_type, control = k.control, made_to = k.made_to,
          installed_on = k.installed_on, manufactured_on = k.manufactured_on, updated_at = now()
        FROM unnest($1::int[], $2::int[], $3::text[], $4::text[], $5::text[], $6::date[], $7::text[]) k(id, opening_id, product_type, control, made_to, installed_on, manufactured_on)
        WHERE c.id = k.id`, [changed.map(p => p.id), changed.map(p => p.opening.id), changed.map(p => p.values.productType), changed.map(p => p.values.control),
        changed.map(p => p.values.madeTo), changed.map(p => p.values.installedOn), changed.map(p => p.values.manufacturedOn)])
    }
    await this.writeInspections(measured, q, copy)
  }

  /** Measurements become inspections of kind import (file and row kept), with findings; the covering points at the newest. */
  private async writeInspections(plans: CoveringPlan[], q: <T extends object>(sql: string, bind: unknown[]) => Promise<T[]>,
    copy: (table: string, columns: string[], rows: Iterable<readonly unknown[]>) => Promise<void>) {
    if (!plans.length) return
    this.counts.inspections.created += plans.length
    const job = this.job
    function* inspections() {
      for (const p of plans) {
        const { record, result, inspectedAt } = p.inspection!
        yield [p.inspectionId, job.workspaceId, p.site.id, p.id, 'import', inspectedAt, record, result.rulesVersion, result.verdict, `Imported from ${job.fileName}, row ${p.row}`, job.id, p.row]
      }
    }
    function* findings() {
      for (const p of plans) {
        for (const x of p.inspection!.result.findings) {
          yield x.verdict === 'not_applicable' ? [p.inspectionId, findingText(x)] : [p.inspectionId, x.clause, x.verdict, x.measured, x.limit, x.unit, x.field, x.source, x.basis, x.message, x.fix]
        }
      }
    }
    await copy('inspections', ['id', 'workspace_id', 'site_id', 'covering_id', 'kind', 'inspected_at', 'record', 'rules_version', 'verdict', 'notes', 'import_id', 'source_row'], inspections())
    await copy('findings', ['inspection_id', 'clause', 'verdict', 'measured', 'limit_value', 'unit', 'field', 'source', 'basis', 'message', 'fix'], findings())
    // Existing coverings move to the new inspection only if it is not older than their last: older measurements are history.
    const existing = plans.filter(p => p.found)
    const latest = new Set(plans.filter(p => !p.found).map(p => p.id!))
    if (existing.length) {
      const moved = await q<{ id: number }>(`UPDATE coverings c SET last_inspection_id = k.inspection_id, last_verdict = k.verdict, last_inspected_at = k.at, updated_at = now()
        FROM unnest($1::int[], $2::int[], $3::text[], $4::timestamptz[]) k(covering_id, inspection_id, verdict, at)
        WHERE c.id = k.covering_id AND (c.last_inspected_at IS NULL OR c.last_inspected_at <= k.at) RETURNING c.id`,
      [existing.map(p => p.id), existing.map(p => p.inspectionId), existing.map(p => p.inspection!.result.verdict), existing.map(p => p.inspection!.inspectedAt)])
      for (const r of moved) latest.add(r.id)
    }
    await this.raiseRemedies(plans, latest, q)
  }

  /** A failing clause opens a remedy, as a fitting's would; closing one still takes an inspection with a photo. */
  private async raiseRemedies(plans: CoveringPlan[], latest: Set<number>, q: <T extends object>(sql: string, bind: unknown[]) => Promise<T[]>) {
    const r: unknown[][] = Array.from({ length: 9 }, () => [])
    plans.forEach((p) => {
      if (!latest.has(p.id!)) return
      const day = p.inspection!.inspectedAt.toISOString().slice(0, 10)
      for (const x of p.inspection!.result.findings) {
        if (x.verdict !== 'fail') continue
        const priority = remedyPriority(x.field, p.site.premises!, p.inspection!.record.childrensRoom === true)
        const due = new Date(`${day}T00:00:00Z`)
        due.setUTCDate(due.getUTCDate() + daysToRemedy[priority]!)
        pushColumns(r, [p.site.id, p.id, x.clause, p.inspectionId, x.message, x.fix, x.source, priority, due.toISOString().slice(0, 10)])
      }
    })
    if (!r[0]!.length) return
    const raised = await q<{ id: number }>(`INSERT INTO fixes (workspace_id, site_id, covering_id, clause, raised_by_inspection_id, message, fix, source, priority, due_on)
      SELECT $1, * FROM unnest($2::int[], $3::int[], $4::text[], $5::int[], $6::text[], $7::text[], $8::text[], $9::int[], $10::date[])
      ON CONFLICT (covering_id, clause) WHERE status = 'open' DO NOTHING RETURNING id`, [this.job.workspaceId, ...r])
    this.counts.remediesRaised += raised.length
  }
}
