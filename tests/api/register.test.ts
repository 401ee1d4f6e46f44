import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let officer: ApiClient, installer: ApiClient, manager: ApiClient, manager2: ApiClient

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  officer = await signIn(accounts.officer)
  installer = await signIn(accounts.installer)
  manager = await signIn(accounts.manager)
  manager2 = await signIn(accounts.manager2)
})
afterAll(async () => { await db.end() })

describe('lists page, sort and filter', () => {
  it('pages the coverings of the workspace with a total', async () => {
    const p1 = await officer.get('/api/coverings?pageSize=10&page=1&sort=ref')
    const p3 = await officer.get('/api/coverings?pageSize=10&page=3&sort=ref')
    expect(p1.status).toBe(200)
    expect(p1.body.total).toBeGreaterThanOrEqual(27)
    expect(p1.body.items).toHaveLength(10)
    const refs = p1.body.items.map((c: { ref: string }) => c.ref)
    expect(refs).toEqual([...refs].sort())
    expect(p3.body.items.length).toBe(Math.min(10, p1.body.total - 20))
  })

  it('sorts descending with a leading minus and filters by verdict and site', async () => {
    const r = await officer.get(`/api/coverings?siteId=${ids.own.site}&verdict=non_compliant&sort=-ref`)
    expect(r.status).toBe(200)
    expect(r.body.items.length).toBeGreaterThan(0)
    for (const c of r.body.items) {
      expect(c.lastVerdict).toBe('non_compliant')
      expect(c.siteId).toBe(ids.own.site)
    }
    const refs = r.body.items.map((c: { ref: string }) => c.ref)
    expect(refs).toEqual([...refs].sort().reverse())
  })

  it('searches sites by address and sorts them by failures', async () => {
    const r = await officer.get('/api/sites?q=Ironbark')
    expect(r.body.items.map((s: { ref: string }) => s.ref)).toEqual(['WAT'])
    const byFailing = await officer.get('/api/sites?sort=-failing')
    const counts = byFailing.body.items.map((s: { nonCompliantCount: number }) => s.nonCompliantCount)
    expect(counts).toEqual([...counts].sort((a, b) => b - a))
  })

  it('rejects a bad query with the parameter named', async () => {
    const r = await officer.get('/api/coverings?pageSize=1000')
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^pageSize/)
    const s = await officer.get('/api/sites?sort=password')
    expect(s.status).toBe(400)
    expect(s.body.data.fields.sort).toBeTruthy()
  })

  it('shows an installer the sites assigned to them', async () => {
    const r = await installer.get('/api/sites?assigned=me')
    expect(r.body.items.map((s: { ref: string }) => s.ref)).toEqual(expect.arrayContaining(['SPR', 'WAT']))
    expect(r.body.items.some((s: { ref: string }) => s.ref === 'COB')).toBe(false)
    expect(r.body.items.every((s: { assignedToMe: boolean }) => s.assignedToMe)).toBe(true)
  })
})

describe('a property manager sees only their client', () => {
  it('lists only client one\'s sites for manager@ and client two\'s for manager2@', async () => {
    const one = await manager.get('/api/sites')
    const two = await manager2.get('/api/sites')
    // Other tests may add sites to a client; the demo's own sites split like this.
    const refsOne = one.body.items.map((s: { ref: string }) => s.ref)
    const refsTwo = two.body.items.map((s: { ref: string }) => s.ref)
    expect(refsOne).toEqual(expect.arrayContaining(['COB', 'WAT']))
    expect(refsOne).not.toEqual(expect.arrayContaining(['NTB']))
    expect(refsOne.some((r: string) => ['NTB', 'SPR', 'GRY'].includes(r))).toBe(false)
    expect(refsTwo).toEqual(expect.arrayContaining(['NTB', 'SPR']))
    expect(refsTwo.some((r: string) => ['WAT', 'COB', 'GRY'].includes(r))).toBe(false)
  })

  it('answers 404 when manager@ asks for a client-two site by id', async () => {
    const r = await manager.get(`/api/sites/${ids.clientTwo.site}`)
    expect(r.status).toBe(404)
    expect((await manager.get(`/api/coverings/${ids.clientTwo.covering}`)).status).toBe(404)
    expect((await manager.get(`/api/sites/${ids.own.site}`)).status).toBe(200)
  })

  it('cannot write to the register', async () => {
    expect((await manager.patch(`/api/sites/${ids.own.site}`, { name: 'Renamed' })).status).toBe(403)
    expect((await manager.post('/api/units', { siteId: ids.own.site, ref: 'X1' })).status).toBe(403)
  })
})

describe('the register is written through validated bodies', () => {
  it('creates a unit, opening and covering on the spot and logs each', async () => {
    const unit = await installer.post('/api/units', { siteId: ids.own.site, ref: `T${Date.now() % 100000}`, name: 'Test unit' })
    expect(unit.status).toBe(201)
    const opening = await installer.post('/api/openings', { unitId: unit.body.id, ref: 'W1', room: 'Bedroom 3', childrensRoom: true, recessWidthMm: 1200, recessHeightMm: 1500 })
    expect(opening.status).toBe(201)
    expect(opening.body.siteId).toBe(ids.own.site)
    const covering = await installer.post('/api/coverings', { openingId: opening.body.id, ref: `C-${unit.body.id}`, productType: 'roller', control: 'chain_loop', mount: 'inside', widthMm: 1190, dropMm: 1480 })
    expect(covering.status).toBe(201)
    const read = await officer.get(`/api/coverings/${covering.body.id}`)
    expect(read.body).toMatchObject({ room: 'Bedroom 3', widthMm: 1190, lastVerdict: null, childrensRoom: true })
    const log = await db.query(`SELECT action FROM activity_log WHERE entity = 'covering' AND entity_id = $1`, [covering.body.id])
    expect(log.rows.map(r => r.action)).toContain('covering.created')
  })

  it('rejects unknown enums and impossible sizes with the field named, writing nothing', async () => {
    const before = await db.query('SELECT count(*)::int AS n FROM coverings')
    const badEnum = await installer.post('/api/coverings', { openingId: ids.own.opening, ref: 'BAD-1', productType: 'louvre-ish', control: 'chain_loop' })
    expect(badEnum.status).toBe(400)
    expect(badEnum.body.message).toMatch(/^productType/)
    const badSize = await installer.post('/api/coverings', { openingId: ids.own.opening, ref: 'BAD-2', productType: 'roller', control: 'chain_loop', widthMm: -40 })
    expect(badSize.status).toBe(400)
    expect(badSize.body.data.fields.widthMm).toMatch(/above 0 mm/)
    const after = await db.query('SELECT count(*)::int AS n FROM coverings')
    expect(after.rows[0].n).toBe(before.rows[0].n)
  })

  it('answers 409 naming the ref when it is already used on the site', async () => {
    const r = await installer.post('/api/coverings', { openingId: ids.own.opening, ref: 'WAT-1-01', productType: 'roller', control: 'chain_loop' })
    expect(r.status).toBe(409)
    expect(r.body.message).toMatch(/^ref/)
  })

  it('cannot hang a unit on another workspace\'s site', async () => {
    const r = await officer.post('/api/units', { siteId: ids.other.site, ref: 'SNEAK' })
    expect(r.status).toBe(404)
  })

  it('updates a site and keeps the before and after in the activity log', async () => {
    const r = await officer.patch(`/api/sites/${ids.own.site}`, { notes: 'Gate code at the office' })
    expect(r.status).toBe(200)
    expect(r.body.notes).toBe('Gate code at the office')
    const log = await officer.get(`/api/activity?entity=site&entityId=${ids.own.site}`)
    expect(log.body.items[0]).toMatchObject({ action: 'site.updated', userName: 'Dev Okonjo' })
  })
})

describe('inspections are evidence', () => {
  it('the database refuses UPDATE and DELETE on inspections and findings', async () => {
    const { rows: [row] } = await db.query('SELECT id FROM inspections ORDER BY id LIMIT 1')
    await expect(db.query(`UPDATE inspections SET verdict = 'compliant' WHERE id = $1`, [row.id])).rejects.toThrow(/evidence/)
    await expect(db.query('DELETE FROM inspections WHERE id = $1', [row.id])).rejects.toThrow(/evidence/)
    await expect(db.query(`UPDATE findings SET verdict = 'pass' WHERE inspection_id = $1`, [row.id])).rejects.toThrow(/evidence/)
    await expect(db.query('TRUNCATE findings')).rejects.toThrow(/evidence/)
  })

  it('a covering page shows the latest inspection with its findings and sources', async () => {
    const r = await officer.get(`/api/coverings/${ids.own.covering}`)
    expect(r.status).toBe(200)
    const latest = r.body.inspections[0]
    expect(latest.rulesVersion).toMatch(/^AU-/)
    expect(latest.findings.length).toBeGreaterThan(3)
    expect(latest.findings.every((f: { source: string, basis: string }) => f.source && f.basis)).toBe(true)
  })
})

describe('the team list', () => {
  it('gives an officer the active staff of their own workspace only', async () => {
    const r = await officer.get('/api/team')
    expect(r.status).toBe(200)
    const emails = r.body.items.map((u: { name: string }) => u.name)
    expect(emails).toContain('Sam Ferrow')
    expect(emails).not.toContain('Priya Marsh')
    expect(emails).not.toContain('Other Installer')
  })
})
