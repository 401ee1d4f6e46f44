import { spawnSync } from 'node:child_process'
import type pg from 'pg'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { copyInto } from '../../server/services/pg-copy'
import { accounts, ApiClient, database, fixtureIds, signIn } from '../support/api'
import { uploadPhoto } from '../support/photos'

// Every evidence row is hashed and chained per table per workspace by the database. `npm run verify` and the
// admin's line in /api/health recompute the chains; an edit made behind the application's back (with the
// refusing trigger switched off, as only someone with the database's owner rights could) is named by table, id
// and workspace, and putting the row back makes the register verify again.

const measurements = {
  headHeightMm: 2100, lowestCordPointMm: 900, loopPullOutMm: 30, loopPerimeterMm: 60, tensionDevice: true, tensionDeviceHeightMm: 900,
  tensionDeviceHoldN: 80, tensionDeviceTamperProof: true, cleat: false, breakaway: false, innerCordStops: true,
  warningLabel: true, swingTag: true, installerLabel: true, manufacturerLabel: true, climbableFurnitureNearby: false,
}

function verify(args: string[] = []) {
  const r = spawnSync('node_modules/.bin/tsx', ['scripts/verify.ts', ...args], { env: process.env, encoding: 'utf8' })
  return { code: r.status, out: r.stdout + r.stderr }
}

/** Runs `change` on a row with the table's refusing trigger switched off, as tampering would. */
async function behindTheAppsBack(db: pg.Client, table: string, sql: string, params: unknown[]) {
  await db.query('BEGIN')
  try {
    await db.query(`ALTER TABLE ${table} DISABLE TRIGGER ${table}_immutable`)
    await db.query(sql, params)
    await db.query(`ALTER TABLE ${table} ENABLE TRIGGER ${table}_immutable`)
    await db.query('COMMIT')
  }
  catch (err) {
    await db.query('ROLLBACK')
    throw err
  }
}

describe('tamper evidence', () => {
  let db: pg.Client
  let admin: ApiClient
  let otherAdmin: ApiClient
  let inspectionId = 0
  let workspaceId = 0
  let originalNotes: string | null = null

  beforeAll(async () => {
    db = await database()
    const ids = await fixtureIds(db)
    const installer = await signIn(accounts.installer)
    const photo = await uploadPhoto(installer, ids.own.covering, 'tension_device')
    const signed = await installer.post(`/api/coverings/${ids.own.covering}/inspections`,
      { kind: 'fitting', measurements, photoIds: [photo.id], clientKey: `chain-${Date.now()}`, notes: 'Loop tensioned and eased back 10 mm' })
    expect(signed.status, JSON.stringify(signed.body)).toBe(201)
    inspectionId = signed.body.id
    const { rows: [row] } = await db.query('SELECT workspace_id, notes FROM inspections WHERE id = $1', [inspectionId])
    workspaceId = row.workspace_id
    originalNotes = row.notes
    admin = await signIn(accounts.admin)
    otherAdmin = await signIn(accounts.otherAdmin)
  })

  afterAll(async () => {
    await db.end()
  })

  it('chains the rows the application writes, and a clean register verifies (script and health line)', async () => {
    const { rows } = await db.query(`SELECT table_name, count(*)::int AS n FROM evidence_chain_blocks WHERE workspace_id = $1 GROUP BY 1`, [workspaceId])
    const chained = Object.fromEntries(rows.map(r => [r.table_name, r.n]))
    for (const table of ['inspections', 'findings', 'photos', 'inspection_photos', 'activity_log']) expect(chained[table], table).toBeGreaterThan(0)
    const { rows: [unsealed] } = await db.query('SELECT count(*)::int AS n FROM evidence_chain_blocks WHERE seq IS NULL')
    expect(unsealed.n).toBe(0)

    const r = verify()
    expect(r.code, r.out).toBe(0)
    expect(r.out).toMatch(/evidence chain intact \(every workspace\)/)
    expect(r.out).toMatch(/^inspections\s+[\d,]+ rows\s+[\d,]+ blocks\s+intact$/m)
    expect(r.out).toMatch(/chain fingerprint [0-9a-f]{64}/)

    const health = await admin.get('/api/health')
    expect(health.status).toBe(200)
    expect(health.body.evidence).toMatchObject({ status: 'intact', firstBreak: null })
    expect(health.body.evidence.rows).toBeGreaterThan(0)
  })

  it('shows no chain detail to anyone but an admin', async () => {
    for (const who of [null, accounts.officer, accounts.installer, accounts.manager]) {
      const client = who ? await signIn(who) : new ApiClient()
      const health = await client.get('/api/health')
      expect(health.status, String(who)).toBe(200)
      expect(health.body, String(who)).not.toHaveProperty('evidence')
      expect(JSON.stringify(health.body)).not.toMatch(/chain|intact|broken/)
    }
  })

  it('names the edited row (table, id, workspace) in the script and the health line, and verifies again once it is put back', async () => {
    await behindTheAppsBack(db, 'inspections', 'UPDATE inspections SET notes = $2 WHERE id = $1', [inspectionId, 'Loop left slack'])
    try {
      const r = verify()
      expect(r.code, r.out).toBe(1)
      expect(r.out).toContain(`evidence chain BROKEN (every workspace): first at inspections id ${inspectionId} in workspace ${workspaceId}: the row's content changed since it was recorded`)
      expect(r.out).toMatch(/^findings\s+.*intact$/m)

      const health = await admin.get('/api/health')
      expect(health.status).toBe(200)
      expect(health.body.status).toBe('ok')
      expect(health.body.evidence).toMatchObject({
        status: 'broken',
        firstBreak: { table: 'inspections', id: String(inspectionId), workspaceId, problem: 'the row\'s content changed since it was recorded' },
      })

      // Another workspace's admin sees only their own register, which is untouched.
      const other = await otherAdmin.get('/api/health')
      expect(other.body.evidence).toMatchObject({ status: 'intact', firstBreak: null })
      const mine = verify(['--workspace', String(workspaceId)])
      expect(mine.code).toBe(1)
    }
    finally {
      await behindTheAppsBack(db, 'inspections', 'UPDATE inspections SET notes = $2 WHERE id = $1', [inspectionId, originalNotes])
    }
    const again = verify()
    expect(again.code, again.out).toBe(0)
    expect((await admin.get('/api/health')).body.evidence.status).toBe('intact')
  })

  it('names a deleted finding and a row slipped in without its chain trigger', async () => {
    const { rows: [finding] } = await db.query('SELECT * FROM findings WHERE inspection_id = $1 ORDER BY id LIMIT 1', [inspectionId])
    await behindTheAppsBack(db, 'findings', 'DELETE FROM findings WHERE id = $1', [finding.id])
    try {
      const r = verify()
      expect(r.code, r.out).toBe(1)
      expect(r.out).toContain(`first at findings id ${finding.id} in workspace ${workspaceId}: the row is gone`)
    }
    finally {
      const columns = Object.keys(finding)
      await db.query(`INSERT INTO findings (${columns.join(', ')}) VALUES (${columns.map((_, i) => `$${i + 1}`).join(', ')})`, columns.map(c => finding[c]))
    }
    // Put back by a plain INSERT, the row is chained a second time under the same id: the register verifies.
    expect(verify().code).toBe(0)

    await db.query('BEGIN')
    let slipped = 0
    try {
      await db.query('ALTER TABLE activity_log DISABLE TRIGGER activity_log_chain')
      slipped = (await db.query(`INSERT INTO activity_log (workspace_id, action, entity) VALUES ($1, 'note.added', 'site') RETURNING id`, [workspaceId])).rows[0].id
      await db.query('ALTER TABLE activity_log ENABLE TRIGGER activity_log_chain')
      const { rows } = await db.query('SELECT table_name, workspace_id, row_key, problem FROM tautline_evidence_verify() WHERE problem IS NOT NULL')
      expect(rows).toEqual([{ table_name: 'activity_log', workspace_id: workspaceId, row_key: String(slipped), problem: 'the row was never chained' }])
    }
    finally {
      await db.query('ROLLBACK')
    }
  })

  it('chains raw SQL from any time zone, COPY, and concurrent writers and sign-offs without forking, and refuses to change a sealed block', async () => {
    // Two transactions insert into the same chain and commit in the opposite order to the one they wrote in.
    const [a, b] = [await database(), await database()]
    try {
      await a.query(`SET TIME ZONE 'Pacific/Chatham'`)
      await b.query(`SET TIME ZONE 'America/St_Johns'`)
      await a.query('BEGIN')
      await b.query('BEGIN')
      await a.query(`INSERT INTO activity_log (workspace_id, action, entity, at) VALUES ($1, 'note.added', 'site', '2026-03-29 01:30:00+13')`, [workspaceId])
      await b.query(`INSERT INTO activity_log (workspace_id, action, entity) SELECT $1, 'note.added', 'site' FROM generate_series(1, 3)`, [workspaceId])
      await b.query('COMMIT')
      await a.query('COMMIT')
      await copyInto(a, 'activity_log', ['workspace_id', 'action', 'entity', 'detail'],
        Array.from({ length: 200 }, (_, i) => [workspaceId, 'note.added', 'site', { line: i, text: 'tab\there' }]))
    }
    finally {
      await a.end()
      await b.end()
    }
    // Sign-offs at once, on several coverings and twice on one, each writing four chains at commit.
    const { rows: coverings } = await db.query(`SELECT c.id FROM coverings c JOIN sites s ON s.id = c.site_id WHERE s.workspace_id = $1 ORDER BY c.id LIMIT 5`, [workspaceId])
    const installer = await signIn(accounts.installer)
    const photoOf = new Map<number, number>()
    for (const c of coverings) photoOf.set(c.id, (await uploadPhoto(installer, c.id, 'tension_device')).id)
    const answers = await Promise.all([...coverings, coverings[0]].map((c, i) => installer.post(`/api/coverings/${c.id}/inspections`,
      { kind: 'fitting', measurements, photoIds: [photoOf.get(c.id)], clientKey: `chain-burst-${Date.now()}-${i}` })))
    expect(answers.map(a => a.status)).toEqual(answers.map(() => 201))
    for (const table of ['activity_log', 'inspections', 'findings', 'photos', 'inspection_photos']) {
      const { rows } = await db.query(`SELECT seq FROM evidence_chain_blocks WHERE table_name = $2 AND workspace_id = $1 ORDER BY seq`, [workspaceId, table])
      expect(rows.map(r => Number(r.seq)), table).toEqual(rows.map((_, i) => i + 1))
    }
    const r = verify()
    expect(r.code, r.out).toBe(0)

    await expect(db.query(`UPDATE evidence_chain_blocks SET row_hashes[1] = sha256('tampered') WHERE table_name = 'inspections'`)).rejects.toThrow(/cannot be changed/)
    await expect(db.query(`DELETE FROM evidence_chain_blocks WHERE table_name = 'inspections'`)).rejects.toThrow(/cannot be changed/)
    await expect(db.query(`DELETE FROM evidence_chain_heads`)).rejects.toThrow(/cannot be changed/)
  })

  it('says when the chain has been rewritten under a row: a block\'s recorded hash no longer links', async () => {
    await db.query('BEGIN')
    try {
      await db.query('ALTER TABLE evidence_chain_blocks DISABLE TRIGGER evidence_chain_blocks_immutable')
      const { rows: [block] } = await db.query(`UPDATE evidence_chain_blocks SET row_hashes[1] = sha256('tampered')
        WHERE id = (SELECT max(id) FROM evidence_chain_blocks WHERE table_name = 'inspections' AND workspace_id = $1) RETURNING row_keys[1] AS k`, [workspaceId])
      const { rows } = await db.query('SELECT table_name, problems::int, row_key FROM tautline_evidence_verify($1) WHERE problem IS NOT NULL', [workspaceId])
      // The recorded hash no longer matches the row, and the block no longer matches its own link.
      expect(rows).toEqual([{ table_name: 'inspections', problems: 2, row_key: block.k }])
    }
    finally {
      await db.query('ROLLBACK')
    }
  })
})
