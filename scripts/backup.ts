// npm run backup [-- --out DIR]: a consistent dump of the database (one snapshot, pg_dump's custom
// format) plus every object of the photo bucket with a manifest of SHA-256 hashes.
import { spawnSync } from 'node:child_process'
import { createHash } from 'node:crypto'
import { mkdirSync, writeFileSync } from 'node:fs'
import { dirname, join, resolve } from 'node:path'
import { parseArgs } from 'node:util'
import { GetObjectCommand, ListObjectsV2Command } from '@aws-sdk/client-s3'
import { bucket, s3 } from '../server/services/storage'
import { pgTool } from './lib/pg-tools'

const { values } = parseArgs({ options: { out: { type: 'string' } } })
const stamp = new Date().toISOString().replace(/[:.]/g, '-')
const out = resolve(values.out ?? join('backups', stamp))
mkdirSync(join(out, 'objects'), { recursive: true })

const url = process.env.DATABASE_URL
if (!url) throw new Error('DATABASE_URL is not set (run through `npm run backup`)')
console.log(`[tautline] backing up into ${out}`)
const dump = spawnSync(pgTool('pg_dump'), ['--format=custom', '--no-owner', '--no-privileges', `--file=${join(out, 'database.dump')}`, url], { stdio: 'inherit' })
if (dump.status !== 0) throw new Error(`pg_dump failed (exit ${dump.status})`)

interface Entry { key: string, sizeBytes: number, sha256: string, contentType: string | null }
const objects: Entry[] = []
let token: string | undefined
do {
  const page = await s3().send(new ListObjectsV2Command({ Bucket: bucket(), ContinuationToken: token }))
  for (const item of page.Contents ?? []) {
    const key = item.Key!
    // Keys are made by the server; refuse anything that could leave the backup folder.
    if (key.split('/').some(part => part === '..' || part === '') || key.startsWith('/')) throw new Error(`refusing odd object key ${key}`)
    const object = await s3().send(new GetObjectCommand({ Bucket: bucket(), Key: key }))
    const bytes = await object.Body!.transformToByteArray()
    const file = join(out, 'objects', key)
    mkdirSync(dirname(file), { recursive: true })
    writeFileSync(file, bytes)
    objects.push({ key, sizeBytes: bytes.byteLength, sha256: createHash('sha256').update(bytes).digest('hex'), contentType: object.ContentType ?? null })
  }
  token = page.NextContinuationToken
} while (token)

writeFileSync(join(out, 'manifest.json'), `${JSON.stringify({ createdAt: new Date().toISOString(), bucket: bucket(), objects }, null, 2)}\n`)
console.log(`[tautline] backup complete: database.dump and ${objects.length} objects (manifest.json)`)
