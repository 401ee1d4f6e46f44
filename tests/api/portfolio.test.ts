import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, database, fixtureIds, idOf, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { csvOf, importFile, settled } from '../support/jobs'
import { messagesTo, waitForMail } from '../support/mail'

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let officer: ApiClient, manager: ApiClient, manager2: ApiClient
let siteId: number

/** A date `months` months and `days` days before today (UTC), as YYYY-MM-DD. */
function ago(months: number, days = 0) {
  const d = new Date()
  d.setUTCMonth(d.getUTCMonth() - months)
  d.setUTCDate(d.getUTCDate() - days)
  return d.toISOString().slice(0, 10)
}

// Site PRT: one covering per re-inspection state, and one that fails.
const header = ['site_ref', 'site_name', 'address', 'jurisdiction', 'premises', 'unit_ref', 'unit_name', 'opening_ref', 'room', 'covering_ref', 'product_type', 'control',
  'installed_on', 'measured_on', 'head_height_mm', 'lowest_cord_point_mm', 'loop_pull_out_mm', 'tension_device', 'warning_label', 'swing_tag', 'installer_label', 'manufacturer_label', 'made_to', 'installed_per_instructions']
const ok = { product_type: 'roller', control: 'chain_loop', installed_on: '2024-05-01', head_height_mm: '2100', lowest_cord_point_mm: '900', loop_pull_out_mm: '100',
  tension_device: 'no', warning_label: 'yes', swing_tag: 'yes', installer_label: 'yes', manufacturer_label: 'yes', made_to: 'custom', installed_per_instructions: 'yes' }

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  officer = await signIn(accounts.officer)
  manager = await signIn(accounts.manager)
  manager2 = await signIn(accounts.manager2)
  const done = await importFile(manager, csvOf(header, [
    { site_ref: 'PRT', site_name: 'Portfolio Place', address: '4 Ledger Lane, Kellerton NSW 2999', jurisdiction: 'AU', premises: 'rental_home',
      unit_ref: 'A', unit_name: 'Flat A', opening_ref: 'W1', room: 'Living', covering_ref: 'PRT-OVERDUE', ...ok, measured_on: ago(13) },
    { site_ref: 'PRT', unit_ref: 'B', unit_name: 'Flat B', opening_ref: 'W1', room: 'Living', covering_ref: 'PRT-SOON', ...ok, measured_on: ago(12, -10) },
    { site_ref: 'PRT', unit_ref: 'B', opening_ref: 'W2', room: 'Bedroom', covering_ref: 'PRT-LATER', ...ok, measured_on: ago(2) },
    { site_ref: 'PRT', unit_ref: 'C', unit_name: 'Flat C', opening_ref: 'W1', room: 'Living', covering_ref: 'PRT-NEVER', product_type: 'roller', control: 'chain_loop' },
    { site_ref: 'PRT', unit_ref: 'C', opening_ref: 'W2', room: 'Bedroom', covering_ref: 'PRT-FAIL', ...ok, measured_on: ago(1), loop_pull_out_mm: '500', lowest_cord_point_mm: '500' },
  ]), { mode: 'commit' })
  if (done.status !== 'succeeded') throw new Error(`fixture import failed: ${done.error} ${JSON.stringify(done.rowErrors)}`)
  siteId = await idOf(db, `SELECT id FROM sites WHERE ref = 'PRT'`)
})
afterAll(async () => { await db.end() })

describe('the portfolio', () => {
  it('lists the coverings that need action first, with their re-inspection due dates', async () => {
    const r = await manager.get(`/api/portfolio/coverings?siteId=${siteId}`)
    expect(r.status).toBe(200)
    expect(r.body.items.map((c: { ref: string }) => c.ref)).toEqual(['PRT-FAIL', 'PRT-OVERDUE', 'PRT-NEVER', 'PRT-SOON', 'PRT-LATER'])
    const byRef = Object.fromEntries(r.body.items.map((c: { ref: string }) => [c.ref, c]))
    expect(byRef['PRT-OVERDUE']).toMatchObject({ due: 'overdue', dueOn: ago(1), lastVerdict: 'compliant' })
    expect(byRef['PRT-SOON']).toMatchObject({ due: 'due_soon', dueOn: ago(0, -10) })
    expect(byRef['PRT-LATER'].due).toBe('later')
    expect(byRef['PRT-NEVER']).toMatchObject({ due: 'never', dueOn: null, lastVerdict: null })
    expect(byRef['PRT-FAIL']).toMatchObject({ lastVerdict: 'non_compliant', openRemedies: expect.any(Number) })
    expect(byRef['PRT-FAIL'].openRemedies).toBeGreaterThan(0)
    const attention = await manager.get(`/api/portfolio/coverings?siteId=${siteId}&attention=true`)
    expect(attention.body.items.map((c: { ref: string }) => c.ref)).toEqual(['PRT-FAIL', 'PRT-OVERDUE', 'PRT-NEVER', 'PRT-SOON'])
    const overdue = await manager.get(`/api/portfolio/coverings?siteId=${siteId}&due=overdue`)
    expect(overdue.body.items.map((c: { ref: string }) => c.ref)).toEqual(['PRT-OVERDUE'])
  })

  it('counts each unit\'s coverings by verdict and filters units by site, verdict and due date', async () => {
    const r = await manager.get(`/api/portfolio/units?siteId=${siteId}&sort=ref`)
    expect(r.body.items.map((u: { ref: string }) => u.ref)).toEqual(['A', 'B', 'C'])
    const c = r.body.items.find((u: { ref: string }) => u.ref === 'C')
    expect(c).toMatchObject({ name: 'Flat C', coveringCount: 2, nonCompliantCount: 1, uncheckedCount: 1, compliantCount: 0, siteName: 'Portfolio Place' })
    const a = r.body.items.find((u: { ref: string }) => u.ref === 'A')
    expect(a).toMatchObject({ overdueCount: 1, nextDueOn: ago(1) })
    const failing = await manager.get(`/api/portfolio/units?siteId=${siteId}&verdict=non_compliant`)
    expect(failing.body.items.map((u: { ref: string }) => u.ref)).toEqual(['C'])
    const soon = await manager.get(`/api/portfolio/units?siteId=${siteId}&due=due_soon`)
    expect(soon.body.items.map((u: { ref: string }) => u.ref)).toEqual(['B'])
    const summary = await manager.get(`/api/portfolio/summary?siteId=${siteId}`)
    expect(summary.body).toMatchObject({ clientName: 'Brindlewood Lettings', reinspectIntervalMonths: 12, coveringCount: 5, nonCompliantCount: 1, compliantCount: 3,
      uncheckedCount: 1, overdueCount: 1, dueSoonCount: 1 })
  })

  it('takes the re-inspection interval from the client', async () => {
    const set = (months: number) => officer.patch(`/api/clients/${ids.own.client}`, { reinspectIntervalMonths: months })
    expect((await set(24)).status).toBe(200)
    try {
      const r = await manager.get(`/api/portfolio/coverings?siteId=${siteId}&due=overdue`)
      expect(r.body.total).toBe(0)
    }
    finally {
      await set(12)
    }
  })

  it('shows a manager only their own client', async () => {
    expect((await manager.get(`/api/portfolio/units?siteId=${ids.clientTwo.site}`)).status).toBe(404)
    const all = await manager2.get('/api/portfolio/coverings?pageSize=100')
    expect(all.body.items.some((c: { siteId: number }) => c.siteId === siteId)).toBe(false)
    const units = await manager.get('/api/portfolio/units?pageSize=100')
    expect(units.body.items.every((u: { siteId: number }) => u.siteId !== ids.clientTwo.site)).toBe(true)
  })
})

describe('a request for an audit', () => {
  it('e-mails the workspace and its officers, naming the sites and units, and is logged', async () => {
    const unit = await idOf(db, `SELECT id FROM units WHERE site_id = $1 AND ref = 'C'`, [siteId])
    const before = messagesTo('officer@demo.tautline.test').length
    const r = await manager.post('/api/portfolio/audit-requests', { siteIds: [siteId, ids.own.site], unitIds: [unit], message: 'Tenants move in on the 20th.' })
    expect(r.status, JSON.stringify(r.body)).toBe(201)
    // The workspace's contact address first, then every active officer (other tests may have added some).
    expect(r.body.sentTo[0]).toBe('fitters@tallowmere.example')
    expect(r.body.sentTo).toContain('officer@demo.tautline.test')
    const { rows: officers } = await db.query(`SELECT email FROM users WHERE role = 'officer' AND active AND workspace_id = (SELECT workspace_id FROM sites WHERE id = $1)`, [siteId])
    expect(r.body.sentTo.slice(1).sort()).toEqual(officers.map(o => o.email).sort())
    const mail = await waitForMail('officer@demo.tautline.test', before)
    expect(mail.to).toContain('fitters@tallowmere.example')
    expect(mail.subject).toMatch(/Audit requested: Brindlewood Lettings/)
    expect(mail.text).toMatch(/Portfolio Place \(site PRT\)/)
    expect(mail.text).toMatch(/unit C \(Flat C\)/)
    expect(mail.text).toMatch(/Wattle Court \(site WAT\)[\s\S]*every unit/)
    expect(mail.text).toMatch(/Tenants move in on the 20th/)
    const { rows } = await db.query(`SELECT detail FROM activity_log WHERE action = 'portfolio.audit_requested' ORDER BY id DESC LIMIT 1`)
    expect(rows[0].detail.siteIds.sort()).toEqual([siteId, ids.own.site].sort())
  })

  it('refuses another client\'s site or unit, and anyone but a manager', async () => {
    expect((await manager.post('/api/portfolio/audit-requests', { siteIds: [ids.clientTwo.site] })).status).toBe(404)
    expect((await manager.post('/api/portfolio/audit-requests', { siteIds: [siteId], unitIds: [ids.clientTwo.unit] })).status).toBe(404)
    const empty = await manager.post('/api/portfolio/audit-requests', { siteIds: [] })
    expect(empty.status).toBe(400)
    expect(empty.body.message).toMatch(/^siteIds/)
    expect((await officer.post('/api/portfolio/audit-requests', { siteIds: [siteId] })).status).toBe(403)
  })
})

describe('a big export', () => {
  it('builds the client\'s audit CSV as a job, then serves the file', async () => {
    const r = await manager.post('/api/exports', { scope: 'client', id: ids.own.client })
    expect(r.status).toBe(202)
    expect((await manager2.get(`/api/exports/${r.body.id}`)).status).toBe(404)
    const done = await settled(manager, `/api/exports/${r.body.id}`)
    expect(done.status, done.error).toBe('succeeded')
    expect(done.counts.rows).toBe(done.progress.total)
    const file = await manager.get(done.fileUrl)
    expect(file.status).toBe(200)
    expect(file.headers.get('content-disposition')).toMatch(/attachment; filename="tautline-audit-Brindlewood-Lettings-/)
    const lines = String(file.body).trim().split('\n')
    expect(lines[0]).toMatch(/site_ref,site_name,client,jurisdiction/)
    expect(lines).toHaveLength(done.counts.rows + 1)
    expect(String(file.body)).toContain('PRT-FAIL')
  })
})
