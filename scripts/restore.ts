// npm run restore -- --from DIR: brings a backup back into an empty database and bucket, checking
// every object's SHA-256 against the manifest. It refuses a database that already has tables.
import { spawnSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { readFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { parseArgs } from 'node:util'
import { CreateBucketCommand, ListObjectsV2Command, PutObjectCommand } from '@aws-sdk/client-s3'
import pg from 'pg'
import { bucket, s3 } from '../server/services/storage'
import { pgTool } from './lib/pg-tools'

const { values } = parseArgs({ options: { from: { type: 'string' } } })
if (!values.from) {
  console.error('usage: npm run restore -- --from backups/<stamp>')
  process.exit(2)
}
const from = resolve(values.from)
const url = process.env.DATABASE_URL
if (!url) throw new Error('DATABASE_URL is not set (run through `npm run restore`)')
const manifest = JSON.parse(readFileSync(join(from, 'manifest.json'), 'utf8')) as { objects: Array<{ key: string, sha256: string, contentType: string | null }> }

const db = new pg.Client({ connectionString: url })
await db.connect()
const { rows: [tables] } = await db.query(`SELECT count(*)::int AS n FROM information_schema.tables WHERE table_schema = 'public'`)
await db.end()
if (tables.n > 0) {
  console.error(`[tautline] the target database already has ${tables.n} tables; restore only into an empty database`)
  process.exit(2)
}
await s3().send(new CreateBucketCommand({ Bucket: bucket() })).catch((err: { name?: string }) => {
  if (err.name !== 'BucketAlreadyOwnedByYou' && err.name !== 'BucketAlreadyExists') throw err
})
const existing = await s3().send(new ListObjectsV2Command({ Bucket: bucket(), MaxKeys: 1 }))
if ((existing.KeyCount ?? 0) > 0) {
  console.error(`[tautline] the bucket ${bucket()} is not empty; restore only into an empty bucket`)
  process.exit(2)
}

const restore = spawnSync(pgTool('pg_restore'), ['--no-owner', '--no-privileges', '--exit-on-error', `--dbname=${url}`, join(from, 'database.dump')], { stdio: 'inherit' })
if (restore.status !== 0) throw new Error(`pg_restore failed (exit ${restore.status})`)

for (const entry of manifest.objects) {
  const bytes = readFileSync(join(from, 'objects', entry.key))
  const sha = createHash('sha256').update(bytes).digest('hex')
  if (sha !== entry.sha256) throw new Error(`${entry.key}: the backup copy does not match its manifest hash; stopping`)
  await s3().send(new PutObjectCommand({ Bucket: bucket(), Key: entry.key, Body: bytes, ContentType: entry.contentType ?? undefined }))
}
console.log(`[tautline] restored the database and ${manifest.objects.length} objects into ${bucket()}`)
