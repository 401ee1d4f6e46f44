import { EventEmitter } from 'node:events'
import { createWriteStream } from 'node:fs'
import { mkdtemp, open, rm, stat } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { pipeline } from 'node:stream/promises'
import { randomUUID } from 'node:crypto'
import { AbortMultipartUploadCommand, CompleteMultipartUploadCommand, CreateMultipartUploadCommand, PutObjectCommand, UploadPartCommand } from '@aws-sdk/client-s3'
import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import type { Stringifier } from 'csv-stringify'
import type { Client, Job, Site } from '../models'
import { auditCsvStream, writeAuditCsv } from './audit-csv'
import { logActivity } from './activity'
import { createJob, enqueueJob } from './jobs'
import type { JobContext } from './jobs'
import type { Actor } from './scope'
import { bucket, s3 } from './storage'

// A big export (the audit CSV of a whole client) runs as a job: rows go to a temporary file as they are
// read, the file goes to S3, and the page downloads it when the job is done.

interface Params { scope: 'site' | 'client', scopeId: number, objectKey: string, fileName: string }
const EVERY = 1000

export async function createExport(db: Sequelize, actor: Actor, target: { scope: 'site', site: Site } | { scope: 'client', client: Client }) {
  const name = target.scope === 'site' ? target.site.name : target.client.name
  const params: Params = {
    scope: target.scope, scopeId: target.scope === 'site' ? target.site.id : target.client.id,
    objectKey: `w${actor.workspaceId}/exports/${randomUUID()}.csv`,
    fileName: `tautline-audit-${name.replace(/[^\w.-]+/g, '-')}-${new Date().toISOString().slice(0, 10)}.csv`,
  }
  const job = await db.transaction(async (transaction) => {
    const job = await createJob({ workspaceId: actor.workspaceId, clientId: target.scope === 'site' ? target.site.clientId : target.client.id,
      siteId: target.scope === 'site' ? target.site.id : null, kind: 'export', params: { ...params }, createdBy: actor.id }, transaction)
    await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: 'export.started', entity: 'export', entityId: job.id, detail: { scope: params.scope, scopeId: params.scopeId } }, transaction)
    return job
  })
  await enqueueJob(db, job)
  return job
}

/** What writeAuditCsv writes to: counts rows, and stops the export between rows when asked. */
class RowSink extends EventEmitter {
  rows = 0
  private stop: Error | null = null
  constructor(private csv: Stringifier, private ctx: JobContext) { super() }
  write(line: string[]) {
    if (this.stop) throw this.stop
    if (++this.rows % EVERY === 0) this.ctx.checkpoint(this.rows).catch((err: Error) => { this.stop = err })
    const ok = this.csv.write(line)
    if (!ok) this.csv.once('drain', () => this.emit('drain'))
    return ok
  }

  end() { this.csv.end() }
}

export async function runExport(db: Sequelize, ctx: JobContext) {
  const p = ctx.job.params as unknown as Params
  const filter = p.scope === 'site' ? 'c.site_id = :id' : 's.client_id = :id'
  const [total] = await db.query<{ n: number }>(`SELECT count(*)::int AS n FROM coverings c JOIN sites s ON s.id = c.site_id WHERE ${filter}`,
    { type: QueryTypes.SELECT, replacements: { id: p.scopeId } })
  await ctx.checkpoint(0, {}, total!.n)
  const dir = await mkdtemp(join(tmpdir(), 'tautline-export-'))
  const path = join(dir, 'export.csv')
  try {
    const csv = auditCsvStream()
    const sink = new RowSink(csv, ctx)
    const written = pipeline(csv, createWriteStream(path))
    try {
      await writeAuditCsv(db, p.scope === 'site' ? { siteId: p.scopeId } : { clientId: p.scopeId }, sink as unknown as Stringifier)
    }
    catch (err) {
      csv.destroy()
      await written.catch(() => undefined)
      throw err
    }
    await written
    await ctx.checkpoint(sink.rows)
    const { size } = await stat(path)
    await storeFile(path, p.objectKey, size)
    return { rows: sink.rows, sizeBytes: size, fileName: p.fileName }
  }
  finally {
    await rm(dir, { recursive: true, force: true })
  }
}

const PART = 8 * 1024 * 1024

/**
 * Sends the file to S3 in 8 MB parts, so memory stays flat. Parts go as buffers: a streamed body goes out
 * aws-chunked, which some S3-compatible stores (the local fake among them) keep verbatim.
 */
async function storeFile(path: string, key: string, size: number) {
  const file = await open(path)
  const part = async (at: number) => {
    const body = Buffer.alloc(Math.min(PART, size - at))
    await file.read(body, 0, body.length, at)
    return body
  }
  const target = { Bucket: bucket(), Key: key }
  try {
    if (size <= PART) {
      await s3().send(new PutObjectCommand({ ...target, Body: await part(0), ContentType: 'text/csv; charset=utf-8' }))
      return
    }
    const { UploadId } = await s3().send(new CreateMultipartUploadCommand({ ...target, ContentType: 'text/csv; charset=utf-8' }))
    try {
      const parts: Array<{ ETag?: string, PartNumber: number }> = []
      for (let n = 1, at = 0; at < size; n++, at += PART) {
        const { ETag } = await s3().send(new UploadPartCommand({ ...target, UploadId, PartNumber: n, Body: await part(at) }))
        parts.push({ ETag, PartNumber: n })
      }
      await s3().send(new CompleteMultipartUploadCommand({ ...target, UploadId, MultipartUpload: { Parts: parts } }))
    }
    catch (err) {
      await s3().send(new AbortMultipartUploadCommand({ ...target, UploadId })).catch(() => undefined)
      throw err
    }
  }
  finally {
    await file.close()
  }
}

export function exportFile(job: Job) {
  const p = job.params as unknown as Params
  return { objectKey: p.objectKey, fileName: p.fileName }
}
