import { spawnSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { GetObjectCommand, S3Client } from '@aws-sdk/client-s3'
import pg from 'pg'
import { afterAll, describe, expect, it } from 'vitest'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import { uploadPhoto } from '../support/photos'

const s3 = new S3Client({
  endpoint: process.env.S3_ENDPOINT, region: process.env.S3_REGION ?? 'us-east-1', forcePathStyle: true,
  credentials: { accessKeyId: process.env.S3_ACCESS_KEY_ID ?? 'S3RVER', secretAccessKey: process.env.S3_SECRET_ACCESS_KEY ?? 'S3RVER' },
})
const dir = mkdtempSync(join(tmpdir(), 'tautline-backup-'))
const suffix = Date.now().toString(36)
const restoreDb = `tautline_restore_${suffix}`
const restoreBucket = `tautline-restore-${suffix}`
const restoreUrl = process.env.DATABASE_URL!.replace(/\/[^/]+$/, `/${restoreDb}`)
const adminUrl = process.env.DATABASE_URL!.replace(/\/[^/]+$/, '/postgres')

function tsx(script: string, args: string[], env: Record<string, string>) {
  return spawnSync('node_modules/.bin/tsx', [script, ...args], { env: { ...process.env, ...env }, encoding: 'utf8' })
}

async function tableCounts(url: string) {
  const db = new pg.Client({ connectionString: url })
  await db.connect()
  const { rows: tables } = await db.query(`SELECT table_name FROM information_schema.tables WHERE table_schema = 'public' AND table_type = 'BASE TABLE' ORDER BY 1`)
  const counts: Record<string, number> = {}
  for (const { table_name: t } of tables) counts[t] = (await db.query(`SELECT count(*)::int AS n FROM "${t}"`)).rows[0].n
  await db.end()
  return counts
}

afterAll(async () => {
  rmSync(dir, { recursive: true, force: true })
  const admin = new pg.Client({ connectionString: adminUrl })
  await admin.connect()
  await admin.query(`DROP DATABASE IF EXISTS ${restoreDb}`)
  await admin.end()
})

describe('backup and restore', () => {
  it('round-trips the demo data: every table\'s row count and every photo\'s hash', async () => {
    const db = await database()
    const ids = await fixtureIds(db)
    await uploadPhoto(await signIn(accounts.installer), ids.own.covering, 'labels')
    await db.end()

    const backup = tsx('scripts/backup.ts', ['--out', dir], {})
    expect(backup.status, backup.stderr).toBe(0)
    const manifest = JSON.parse(readFileSync(join(dir, 'manifest.json'), 'utf8')) as { objects: Array<{ key: string, sha256: string }> }
    expect(manifest.objects.length).toBeGreaterThan(0)

    const admin = new pg.Client({ connectionString: adminUrl })
    await admin.connect()
    await admin.query(`CREATE DATABASE ${restoreDb}`)
    await admin.end()
    const restore = tsx('scripts/restore.ts', ['--from', dir], { DATABASE_URL: restoreUrl, S3_BUCKET: restoreBucket })
    expect(restore.status, restore.stderr + restore.stdout).toBe(0)

    const [before, after] = [await tableCounts(process.env.DATABASE_URL!), await tableCounts(restoreUrl)]
    expect(Object.keys(after).length).toBeGreaterThan(15)
    expect(after).toEqual(before)

    const restored = new pg.Client({ connectionString: restoreUrl })
    await restored.connect()
    const { rows: photos } = await restored.query('SELECT object_key, sha256 FROM photos')
    expect(photos.length).toBeGreaterThan(0)
    for (const p of photos) {
      const object = await s3.send(new GetObjectCommand({ Bucket: restoreBucket, Key: p.object_key }))
      const sha = createHash('sha256').update(await object.Body!.transformToByteArray()).digest('hex')
      expect(sha, p.object_key).toBe(p.sha256)
    }
    // The evidence triggers come back too.
    await expect(restored.query(`UPDATE inspections SET verdict = 'compliant'`)).rejects.toThrow(/evidence/)
    // So does the tamper-evidence chain: the restored register verifies clean, and goes on chaining new rows.
    await restored.query(`INSERT INTO activity_log (workspace_id, action, entity) SELECT id, 'note.added', 'site' FROM workspaces`)
    await restored.end()
    const verified = tsx('scripts/verify.ts', [], { DATABASE_URL: restoreUrl })
    expect(verified.status, verified.stdout + verified.stderr).toBe(0)
    expect(verified.stdout).toMatch(/evidence chain intact \(every workspace\)/)
  })

  it('refuses to restore over a database that has tables', () => {
    const r = tsx('scripts/restore.ts', ['--from', dir], {})
    expect(r.status).toBe(2)
    expect(r.stderr).toMatch(/already has \d+ tables/)
  })
})
