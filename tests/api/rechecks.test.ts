import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, database, fixtureIds, idOf, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { csvOf, importFile, settled } from '../support/jobs'

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let officer: ApiClient, manager: ApiClient, installer: ApiClient
let siteId: number

// Site RCK: one covering whose 210 mm loop hangs 900 mm up (under the 220 mm limit of AU-2026.12.1, over
// the 200 mm of the test fixture), one with a 150 mm loop (under both), and one never measured.
const header = ['site_ref', 'site_name', 'address', 'jurisdiction', 'premises', 'unit_ref', 'opening_ref', 'room', 'covering_ref', 'product_type', 'control', 'made_to',
  'installed_on', 'measured_on', 'head_height_mm', 'lowest_cord_point_mm', 'loop_pull_out_mm', 'tension_device', 'warning_label', 'swing_tag', 'installer_label', 'manufacturer_label', 'installed_per_instructions']
const measured = { product_type: 'roller', control: 'chain_loop', made_to: 'custom', installed_on: '2025-05-01', measured_on: '2026-06-02', head_height_mm: '2100',
  lowest_cord_point_mm: '900', tension_device: 'no', warning_label: 'yes', swing_tag: 'yes', installer_label: 'yes', manufacturer_label: 'yes', installed_per_instructions: 'yes' }

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  officer = await signIn(accounts.officer)
  manager = await signIn(accounts.manager)
  installer = await signIn(accounts.installer)
  const done = await importFile(officer, csvOf(header, [
    { site_ref: 'RCK', site_name: 'Recheck Row', address: '9 Rule Street, Kellerton NSW 2999', jurisdiction: 'AU', premises: 'rental_home', unit_ref: '1', opening_ref: 'W1', room: 'Living',
      covering_ref: 'RCK-1', ...measured, loop_pull_out_mm: '210' },
    { site_ref: 'RCK', unit_ref: '1', opening_ref: 'W2', room: 'Bedroom', covering_ref: 'RCK-2', ...measured, loop_pull_out_mm: '150' },
    { site_ref: 'RCK', unit_ref: '2', opening_ref: 'W1', room: 'Living', covering_ref: 'RCK-3', product_type: 'roller', control: 'chain_loop' },
  ]), { mode: 'commit', clientId: ids.own.client })
  if (done.status !== 'succeeded') throw new Error(`fixture import failed: ${done.error}`)
  siteId = await idOf(db, `SELECT id FROM sites WHERE ref = 'RCK'`)
})
afterAll(async () => { await db.end() })

const verdictOf = async (ref: string) => (await db.query('SELECT last_verdict FROM coverings WHERE ref = $1', [ref])).rows[0].last_verdict
const inspectionCount = async () => Number((await db.query('SELECT count(*) AS n FROM inspections WHERE site_id = $1', [siteId])).rows[0].n)

describe('a re-check after a rule-set version bump', () => {
  it('changes the verdicts it should, records the new version, and makes up no inspection', async () => {
    expect(await verdictOf('RCK-1')).toBe('compliant')
    const inspectionsBefore = await inspectionCount()
    const r = await officer.post('/api/rechecks', { scope: 'site', id: siteId, ruleSetFixture: 'au-loop-200' })
    expect(r.status).toBe(202)
    expect(r.body).toMatchObject({ kind: 'recheck', scope: 'site', scopeId: siteId, scopeName: 'Recheck Row' })
    const done = await settled(officer, `/api/rechecks/${r.body.id}`)
    expect(done.status, done.error).toBe('succeeded')
    expect(done.progress).toEqual({ done: 2, total: 2, percent: 100 })
    expect(done.counts).toMatchObject({ checked: 2, notMeasured: 1, newlyFailing: 1, newlyPassing: 0, nowIncomplete: 0, unchanged: 1, rulesVersions: ['AU-test-loop-200'] })

    const changes = await officer.get(`/api/rechecks/${r.body.id}/changes`)
    expect(changes.body.total).toBe(1)
    const [change] = changes.body.items
    const lastInspection = await idOf(db, `SELECT last_inspection_id FROM coverings WHERE ref = 'RCK-1'`)
    expect(change).toMatchObject({ coveringRef: 'RCK-1', previousVerdict: 'compliant', verdict: 'non_compliant', change: 'newly_failing',
      rulesVersion: 'AU-test-loop-200', inspectionId: lastInspection, failedClauses: ['au.loop-reach'] })
    expect(await verdictOf('RCK-1')).toBe('non_compliant')
    expect(await verdictOf('RCK-3')).toBeNull()
    expect(await inspectionCount()).toBe(inspectionsBefore)
    const { rows } = await db.query('SELECT rules_version, inspection_id FROM check_results WHERE job_id = $1', [r.body.id])
    expect(rows).toHaveLength(2)
    expect(rows.every(x => x.rules_version === 'AU-test-loop-200')).toBe(true)
  })

  it('re-checked with the released rules again, the covering is newly passing', async () => {
    const r = await officer.post('/api/rechecks', { scope: 'client', id: ids.own.client })
    const done = await settled(officer, `/api/rechecks/${r.body.id}`)
    expect(done.status).toBe('succeeded')
    expect(done.counts.newlyPassing).toBeGreaterThanOrEqual(1)
    expect(done.counts.rulesVersions).toContain('AU-2026.12.1')
    expect(done.counts.rulesVersions).not.toContain('AU-test-loop-200')
    const passing = await officer.get(`/api/rechecks/${r.body.id}/changes?change=newly_passing&pageSize=100`)
    expect(passing.body.items.map((c: { coveringRef: string }) => c.coveringRef)).toContain('RCK-1')
    expect(await verdictOf('RCK-1')).toBe('compliant')
  })

  it('refuses check results being edited: they are evidence', async () => {
    await expect(db.query(`UPDATE check_results SET verdict = 'compliant' WHERE id = (SELECT min(id) FROM check_results)`)).rejects.toThrow(/evidence/)
  })

  it('takes a rule-set fixture only by a known name', async () => {
    const r = await officer.post('/api/rechecks', { scope: 'site', id: siteId, ruleSetFixture: 'au-no-such-thing' })
    expect(r.status).toBe(400)
    expect(r.body.message).toMatch(/^ruleSetFixture/)
  })
})

describe('who may re-check what', () => {
  it('lets a manager re-check their own client and sites, not the workspace or another client', async () => {
    expect((await manager.post('/api/rechecks', { scope: 'workspace' })).status).toBe(403)
    expect((await manager.post('/api/rechecks', { scope: 'site', id: ids.clientTwo.site })).status).toBe(404)
    expect((await manager.post('/api/rechecks', { scope: 'client', id: ids.clientTwo.client })).status).toBe(404)
    const own = await manager.post('/api/rechecks', { scope: 'site', id: ids.own.site })
    expect(own.status).toBe(202)
    expect((await settled(manager, `/api/rechecks/${own.body.id}`)).status).toBe('succeeded')
    expect((await installer.post('/api/rechecks', { scope: 'site', id: ids.own.site })).status).toBe(403)
    const theirs = await officer.post('/api/rechecks', { scope: 'site', id: ids.clientTwo.site })
    expect((await manager.get(`/api/rechecks/${theirs.body.id}`)).status).toBe(404)
    const listed = await manager.get('/api/rechecks?pageSize=100')
    expect(listed.body.items.some((j: { id: number }) => j.id === theirs.body.id)).toBe(false)
  })

  it('asks for an id unless the scope is the workspace', async () => {
    const r = await officer.post('/api/rechecks', { scope: 'site' })
    expect(r.status).toBe(400)
    expect(r.body.data.fields.id).toBeTruthy()
  })
})

describe('a job whose server stopped', () => {
  it('does not stay running: the sweep ends it with a message', async () => {
    const user = await idOf(db, 'SELECT id FROM users WHERE email = $1', [accounts.officer])
    const ws = await idOf(db, 'SELECT workspace_id FROM sites WHERE id = $1', [siteId])
    const { rows: [job] } = await db.query(`INSERT INTO jobs (workspace_id, client_id, kind, status, params, created_by, attempts, started_at, heartbeat_at, updated_at)
      VALUES ($1, $2, 'recheck', 'running', $3, $4, 1, now() - interval '10 minutes', now() - interval '10 minutes', now() - interval '10 minutes') RETURNING id`,
    [ws, ids.own.client, JSON.stringify({ scope: 'client', scopeId: ids.own.client }), user])
    const done = await settled(officer, `/api/rechecks/${job.id}`, 20_000)
    expect(done.status).toBe('failed')
    expect(done.error).toMatch(/Interrupted when a server stopped/)
  })
})
