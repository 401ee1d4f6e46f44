import { parse } from 'csv-parse/sync'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, database, idOf, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { uploadPhoto } from '../support/photos'

let db: pg.Client
let officer: ApiClient, installer: ApiClient, manager: ApiClient
let cob: number, spr: number, clientOne: number, clientTwo: number
const covering = (ref: string) => idOf(db, 'SELECT id FROM coverings WHERE ref = $1', [ref])

beforeAll(async () => {
  db = await database()
  officer = await signIn(accounts.officer)
  installer = await signIn(accounts.installer)
  manager = await signIn(accounts.manager)
  cob = await idOf(db, `SELECT id FROM sites WHERE ref = 'COB'`)
  spr = await idOf(db, `SELECT id FROM sites WHERE ref = 'SPR'`)
  clientOne = await idOf(db, `SELECT client_id FROM sites WHERE ref = 'COB'`)
  clientTwo = await idOf(db, `SELECT client_id FROM sites WHERE ref = 'SPR'`)
})
afterAll(async () => { await db.end() })

// EN 13120 via retailer guidance (secondary): a loop whose lowest point is under 1500 mm needs a safety device.
const euPassing = { headHeightMm: 2300, lowestCordPointMm: 1550, loopPullOutMm: 150, loopPerimeterMm: 300, tensionDevice: false, breakaway: false, cleat: false,
  innerCordStops: true, warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false }

describe('a site audit, walked covering by covering', () => {
  let auditId: number
  it('opens with every covering in place, and opening again resumes the same audit', async () => {
    const first = await officer.post(`/api/sites/${cob}/audits`)
    expect(first.status).toBe(201)
    const inPlace = (await db.query(`SELECT count(*)::int AS n FROM coverings WHERE site_id = $1 AND status = 'in_place'`, [cob])).rows[0].n
    expect(first.body.progress).toEqual({ done: 0, total: inPlace })
    auditId = first.body.id
    const again = await officer.post(`/api/sites/${cob}/audits`)
    expect(again.status).toBe(200)
    expect(again.body).toMatchObject({ id: auditId, resumed: true })
  })

  it('needs a reason for a covering it could not reach', async () => {
    const id = await covering('COB-3-01')
    const bad = await officer.post(`/api/audits/${auditId}/items`, { coveringId: id, status: 'not_accessible' })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^reason/)
    const ok = await officer.post(`/api/audits/${auditId}/items`, { coveringId: id, status: 'not_accessible', reason: 'Tenant away; flat locked' })
    expect(ok.body.progress.done).toBe(1)
  })

  it('refuses to close while coverings are still to be seen, naming how many', async () => {
    const r = await officer.post(`/api/audits/${auditId}/close`, {})
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^items: \d+ of \d+ coverings are still/)
  })

  it('re-measures one with an audit inspection and confirms the rest unchanged, then closes with the officer\'s name', async () => {
    const id = await covering('COB-2-01')
    const photo = await uploadPhoto(officer, id, 'whole')
    const measured = await officer.post(`/api/coverings/${id}/inspections`, { auditId, measurements: euPassing, photoIds: [photo.id] })
    expect(measured.status).toBe(201)
    expect(measured.body.kind).toBe('audit')
    const detail = await officer.get(`/api/audits/${auditId}`)
    for (const item of detail.body.items.filter((i: { status: string }) => i.status === 'pending')) {
      const r = await officer.post(`/api/audits/${auditId}/items`, item.lastVerdict
        ? { coveringId: item.coveringId, status: 'confirmed' }
        : { coveringId: item.coveringId, status: 'not_accessible', reason: 'Never measured; blind boxed in storage' })
      expect(r.status, JSON.stringify(r.body)).toBe(200)
    }
    const closed = await officer.post(`/api/audits/${auditId}/close`, { notes: 'Walked with the caretaker' })
    expect(closed.status).toBe(200)
    expect(closed.body).toMatchObject({ status: 'closed', closedByName: 'Dev Okonjo' })
    expect(closed.body.progress.done).toBe(closed.body.progress.total)
    const kinds = await db.query(`SELECT kind, count(*)::int AS n FROM inspections WHERE audit_id = $1 GROUP BY kind`, [auditId])
    expect(kinds.rows).toEqual([{ kind: 'audit', n: expect.any(Number) }])
    const overview = await manager.get(`/api/sites/${cob}/overview`)
    expect(overview.status).toBe(200)
    expect(overview.body.trend.at(-1)).toMatchObject({ auditId, closedByName: 'Dev Okonjo' })
    expect(overview.body.byUnit.length).toBe(3)
  })
})

describe('remedies (fixes) tracked to closure', () => {
  it('raises one per failing clause, first for a loop in a child\'s room', async () => {
    const r = await officer.get(`/api/fixes?siteId=${cob}&sort=priority`)
    expect(r.status).toBe(200)
    expect(r.body.total).toBeGreaterThan(0)
    const nursery = r.body.items.find((f: { coveringRef: string }) => f.coveringRef === 'COB-1-02')
    expect(nursery).toMatchObject({ priority: 1, status: 'open', room: 'Nursery' })
    expect(nursery.source).toBeTruthy()
  })

  it('takes an assignee from the team and a due date, logging the change', async () => {
    const [fix] = (await officer.get(`/api/fixes?siteId=${spr}`)).body.items
    const installerId = await idOf(db, 'SELECT id FROM users WHERE email = $1', [accounts.installer])
    const managerId = await idOf(db, 'SELECT id FROM users WHERE email = $1', [accounts.manager])
    expect((await officer.patch(`/api/fixes/${fix.id}`, { assigneeId: managerId })).status).toBe(400)
    const r = await officer.patch(`/api/fixes/${fix.id}`, { assigneeId: installerId, dueOn: '2026-01-05' })
    expect(r.status).toBe(200)
    expect(r.body).toMatchObject({ assigneeName: 'Sam Ferrow', dueOn: '2026-01-05', overdue: true })
    const overdue = await officer.get(`/api/fixes?overdue=true`)
    expect(overdue.body.items.some((f: { id: number }) => f.id === fix.id)).toBe(true)
    const log = await db.query(`SELECT action FROM activity_log WHERE entity = 'fix' AND entity_id = $1`, [fix.id])
    expect(log.rows.map(l => l.action)).toContain('fix.updated')
    expect((await installer.patch(`/api/fixes/${fix.id}`, { dueOn: '2026-02-01' })).status).toBe(403)
  })

  it('closes only through a later passing inspection of the covering that carries a photo', async () => {
    const id = await covering('SPR-1-02')
    const open = async () => (await officer.get(`/api/fixes?coveringId=${id}&status=open`)).body.total as number
    expect(await open()).toBeGreaterThan(0)
    const passing = { headHeightMm: 2150, lowestCordPointMm: 880, loopPullOutMm: 35, loopPerimeterMm: 70, tensionDevice: true, tensionDeviceHeightMm: 880,
      tensionDeviceHoldN: 85, tensionDeviceTamperProof: true, cleat: false, breakaway: false, innerCordStops: true,
      warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false, installedPerInstructions: true }
    const device = await uploadPhoto(installer, id, 'tension_device')
    // The device photo is required, so this inspection has one: remedies close with it.
    const r = await installer.post(`/api/coverings/${id}/inspections`, { measurements: passing, photoIds: [device.id] })
    expect(r.status).toBe(201)
    expect(r.body.verdict).toBe('compliant')
    expect(await open()).toBe(0)
    const closed = (await officer.get(`/api/fixes?coveringId=${id}&status=closed`)).body.items
    expect(closed[0].closedByInspectionId).toBe(r.body.id)
  })

  it('stays open when the passing inspection has no photo', async () => {
    const id = await covering('NTB-A-02')
    const before = (await officer.get(`/api/fixes?coveringId=${id}&status=open`)).body.total
    expect(before).toBeGreaterThan(0)
    // SOR/2019-97 s 5: a reachable free-end cord of at most 22 cm.
    const r = await installer.post(`/api/coverings/${id}/inspections`, { measurements: { headHeightMm: 2050, freeCordLengthMm: 150, loopPerimeterMm: 300, loopPullOutMm: 150, cordSpanMm: 150, jointFreeCordsMm: 0, lowestCordPointMm: 1400, innerCordStops: true, warningLabel: true, manufacturerLabel: true, innerCordsReachable: false, bilingualInformation: true } })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    expect((await officer.get(`/api/fixes?coveringId=${id}&status=open`)).body.total).toBe(before)
  })
})

describe('the audit CSV', () => {
  it('has a header and one row per covering, and neutralises a formula in a unit name', async () => {
    const { rows: [unit] } = await db.query(`SELECT u.id FROM units u JOIN sites s ON s.id = u.site_id WHERE s.ref = 'COB' ORDER BY u.id LIMIT 1`)
    expect((await officer.patch(`/api/units/${unit.id}`, { name: '=HYPERLINK("x")' })).status).toBe(200)
    const res = await fetch(`${process.env.TEST_BASE_URL}/api/sites/${cob}/audit.csv`, { headers: { cookie: officer.cookie! } })
    expect(res.status).toBe(200)
    expect(res.headers.get('content-type')).toMatch(/text\/csv; charset=utf-8/)
    const rows = parse(await res.text(), { bom: true, columns: true }) as Array<Record<string, string>>
    // Every covering the site has had: a removed one stays, with its status and removal.
    const all = (await db.query(`SELECT count(*)::int AS n FROM coverings WHERE site_id = $1`, [cob])).rows[0].n
    expect(rows).toHaveLength(all)
    expect(Object.keys(rows[0]!)).toEqual(expect.arrayContaining(['site_ref', 'unit_ref', 'unit_name', 'room', 'covering_ref', 'status', 'removed_on', 'removed_by', 'removal_reason',
      'loop_pull_out_mm', 'verdict', 'failed_clauses', 'rules_version', 'photo_count', 'audit_id', 'audit_outcome', 'audit_note', 'measured_by', 'measured_on', 'confirmed_by', 'confirmed_on']))
    expect(Object.keys(rows[0]!)).not.toContain('inspector')
    // The closed audit above: who measured stays named apart from the officer who confirmed.
    const confirmed = rows.filter(r => r.audit_outcome === 'confirmed_unchanged')
    expect(confirmed.length).toBeGreaterThan(0)
    for (const r of confirmed) {
      expect(r).toMatchObject({ confirmed_by: 'Dev Okonjo', last_inspection_kind: 'audit' })
      expect(r.measured_by).toBeTruthy()
      expect(r.measured_by).not.toBe('Dev Okonjo')
      expect(r.measured_on! < r.confirmed_on!).toBe(true)
    }
    const measuredRow = rows.find(r => r.covering_ref === 'COB-2-01')!
    expect(measuredRow).toMatchObject({ audit_outcome: 'measured', measured_by: 'Dev Okonjo', confirmed_by: '', confirmed_on: '' })
    const locked = rows.find(r => r.covering_ref === 'COB-3-01')!
    expect(locked).toMatchObject({ audit_outcome: 'not_accessible', audit_note: 'Tenant away; flat locked' })
    expect(new Set(rows.map(r => r.audit_id)).size).toBe(1)
    const named = rows.filter(r => r.unit_name!.includes('HYPERLINK'))
    expect(named.length).toBeGreaterThan(0)
    for (const r of named) expect(r.unit_name).toBe(`'=HYPERLINK("x")`)
    const failing = rows.find(r => r.verdict === 'non_compliant')!
    expect(failing.failed_clauses).toMatch(/^eu\.[\w-]+ \[.+\]/)
  })

  it('covers a whole client, and a manager gets only their own client\'s file', async () => {
    const own = await fetch(`${process.env.TEST_BASE_URL}/api/clients/${clientOne}/audit.csv`, { headers: { cookie: manager.cookie! } })
    expect(own.status).toBe(200)
    const rows = parse(await own.text(), { bom: true, columns: true }) as Array<Record<string, string>>
    const refs = new Set(rows.map(r => r.site_ref))
    expect(refs.has('WAT') && refs.has('COB')).toBe(true)
    expect(['SPR', 'NTB', 'GRY'].some(r => refs.has(r))).toBe(false)
    expect((await manager.get(`/api/clients/${clientTwo}/audit.csv`)).status).toBe(404)
    expect((await manager.get(`/api/sites/${spr}/audit.csv`)).status).toBe(404)
    expect((await installer.get(`/api/sites/${cob}/audit.csv`)).status).toBe(403)
  })
})
