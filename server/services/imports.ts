import { isUtf8 } from 'node:buffer'
import { randomUUID, webcrypto } from 'node:crypto'
import { Readable } from 'node:stream'
import { setImmediate as nextTurn } from 'node:timers/promises'
import { parse } from 'csv-parse'
import type { Parser } from 'csv-parse'
import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { Client, ImportFile, Job } from '../models'
import { MAX_IMPORT_BYTES, MAX_IMPORT_ROWS, mapHeader } from '../../shared/schemas/imports'
import type { ImportDetail, ImportRowError, ImportSummary } from '../../shared/types/jobs'
import type { ListResult } from '../../shared/schemas/common'
import { logActivity } from './activity'
import { ImportBatcher } from './import-batch'
import { JobFailed, createJob, enqueueJob, jobJson } from './jobs'
import type { JobContext } from './jobs'
import { paged } from './paged'
import { clientLimit, orderBy } from './scope'
import type { Actor } from './scope'
import { getObject, putObject } from './storage'
import { Refusal } from '../utils/refusal'

/** Rows read and written per step; the only rows ever held in memory. */
export const IMPORT_BATCH = 500
/** Problems kept per import for people to page through; the count covers them all. */
export const KEPT_PROBLEMS = 1000

export class ImportRefusedError extends Refusal {
  constructor(field: string, message: string, statusCode = 400) { super(statusCode, field, message) }
}

function csvParser(): Parser {
  return parse({ bom: true, relax_column_count: true, skip_empty_lines: true, max_record_size: 64 * 1024 })
}

function csvProblem(err: unknown) {
  const e = err as { message?: string, lines?: number }
  return `the file is not valid CSV${e.lines ? ` near line ${e.lines}` : ''}: ${(e.message ?? 'unreadable').replace(/^Invalid (Record|Opening Quote): /, '')}`
}

/** Records in a CSV file: line breaks outside quotes, not counting blank lines (one pass over the bytes, no parsing). */
export function countCsvRecords(data: Uint8Array) {
  return scanCsv(data).records
}

/** Counts records across slices of a file, so a long file can be scanned a slice at a time. */
class CsvScan {
  records = 0
  inQuotes = false
  lineHasText = false
  line = 1
  quoteLine = 0

  feed(data: Uint8Array, from: number, to: number) {
    let { records, inQuotes, lineHasText, line, quoteLine } = this
    for (let i = from; i < to; i++) {
      const b = data[i]!
      if (b === 0x22) {
        inQuotes = !inQuotes
        lineHasText = true
        if (inQuotes) quoteLine = line
      }
      else if (b === 0x0a) {
        line++
        if (!inQuotes) { if (lineHasText) records++; lineHasText = false }
      }
      else if (b !== 0x0d) lineHasText = true
    }
    Object.assign(this, { records, inQuotes, lineHasText, line, quoteLine })
  }

  result(): { records: number, unclosedQuoteLine?: number } {
    return { records: this.records + (this.lineHasText ? 1 : 0), unclosedQuoteLine: this.inQuotes ? this.quoteLine : undefined }
  }
}

/**
 * One pass over the bytes, no parsing: the records (line breaks outside quotes, blank lines not counted), and the
 * line where a quoted cell opened that is never closed, if one is.
 */
export function scanCsv(data: Uint8Array) {
  const scan = new CsvScan()
  scan.feed(data, 0, data.length)
  return scan.result()
}

/** The same pass a megabyte at a time, letting other requests in between, so a 32 MB file never holds anyone up. */
async function scanCsvInTurns(data: Uint8Array) {
  const scan = new CsvScan()
  for (let from = 0; from < data.length; from += SCAN_SLICE_BYTES) {
    scan.feed(data, from, Math.min(data.length, from + SCAN_SLICE_BYTES))
    await nextTurn()
  }
  return scan.result()
}
const SCAN_SLICE_BYTES = 1024 * 1024

/** The 1-based line of a byte offset. */
function lineAt(data: Uint8Array, offset: number) {
  let line = 1
  for (let i = 0; i < offset; i++) if (data[i] === 0x0a) line++
  return line
}

/** Text problems that would otherwise garble cells silently: UTF-16, bytes that are not UTF-8, binary data. */
function textProblem(data: Uint8Array): string | undefined {
  if ((data[0] === 0xFF && data[1] === 0xFE) || (data[0] === 0xFE && data[1] === 0xFF)) {
    return 'it is saved as UTF-16 text; save it as "CSV UTF-8" and import again'
  }
  const nul = data.indexOf(0)
  if (nul >= 0) return `it holds binary data (a NUL byte on line ${lineAt(data, nul)}), not CSV text`
  if (!isUtf8(data)) {
    // Find the first line that is not UTF-8, so the person knows where to look.
    let start = 0
    for (;;) {
      const end = data.indexOf(0x0a, start)
      const stop = end < 0 ? data.length : end
      if (!isUtf8(data.subarray(start, stop))) break
      if (end < 0) break
      start = end + 1
    }
    return `line ${lineAt(data, start)} is not UTF-8 text (perhaps the file was saved as Latin-1 or Windows-1252); save it as "CSV UTF-8" and import again`
  }
  return undefined
}

/** Checks the header and counts the rows for the progress bar; the job reads every row properly later. */
export async function surveyCsv(data: Uint8Array): Promise<{ rows: number }> {
  const problem = textProblem(data)
  if (problem) throw new ImportRefusedError('file', `file: ${problem}`)
  if (!data.some(b => b !== 0x20 && b !== 0x09 && b !== 0x0a && b !== 0x0d && b !== 0xEF && b !== 0xBB && b !== 0xBF)) throw new ImportRefusedError('file', 'file: it is empty; start from the template')
  let header: string[] | undefined
  try {
    const parser = Readable.from([data.subarray(0, 64 * 1024)]).pipe(parse({ bom: true, to: 1, skip_empty_lines: true, relax_column_count: true, relax_quotes: true }))
    for await (const record of parser as AsyncIterable<string[]>) header ??= record
  }
  catch (err) {
    throw new ImportRefusedError('file', `file: ${csvProblem(err)}`)
  }
  if (!header) throw new ImportRefusedError('file', 'file: it is empty; start from the template')
  const mapped = mapHeader(header)
  if ('error' in mapped) throw new ImportRefusedError('file', `file: ${mapped.error}`)
  const scan = await scanCsvInTurns(data)
  if (scan.unclosedQuoteLine) throw new ImportRefusedError('file', `file: a quoted cell opened on line ${scan.unclosedQuoteLine} is never closed`)
  const rows = scan.records - 1
  if (rows < 1) throw new ImportRefusedError('file', 'file: there are no rows below the header; fill in the template and try again')
  if (rows > MAX_IMPORT_ROWS) throw new ImportRefusedError('file', `file: it has ${rows.toLocaleString('en-GB')} rows; import at most ${MAX_IMPORT_ROWS.toLocaleString('en-GB')} at a time`, 413)
  return { rows }
}

/** The client an import writes into: a manager's own; for staff the one chosen on the form. */
export async function importClient(actor: Actor, clientId: number | undefined) {
  const id = clientLimit(actor) ?? clientId
  if (!id) throw new ImportRefusedError('clientId', 'clientId: choose the client whose units the file holds')
  const client = await Client.findOne({ where: { id, workspaceId: actor.workspaceId } })
  if (!client) throw new ImportRefusedError('clientId', 'clientId: no such client in your workspace', 404)
  return client
}

/** Stores the file in S3 (so any server process can read it) and queues the import. */
export async function createImport(db: Sequelize, actor: Actor, args: { client: Client, fileName: string, data: Uint8Array, mode: 'dry_run' | 'commit', skipInvalid: boolean }) {
  if (args.data.byteLength > MAX_IMPORT_BYTES) {
    throw new ImportRefusedError('file', `file: it is ${(args.data.byteLength / 1048576).toFixed(1)} MB; the limit is 32 MB, so split it and import the parts`, 413)
  }
  const { rows } = await surveyCsv(args.data)
  // Hashed off the event loop (Web Crypto runs the digest on a worker thread).
  const sha256 = Buffer.from(await webcrypto.subtle.digest('SHA-256', args.data)).toString('hex')
  const objectKey = `w${actor.workspaceId}/imports/${randomUUID()}.csv`
  await putObject(objectKey, args.data, 'text/csv', sha256)
  return queueImport(db, actor, { clientId: args.client.id, mode: args.mode, skipInvalid: args.skipInvalid, dryRunId: null, fileName: args.fileName,
    objectKey, sizeBytes: args.data.byteLength, sha256, rowCount: rows })
}

/** Commits the very file a dry run checked, without sending it again. */
export async function commitDryRun(db: Sequelize, actor: Actor, dryRun: { job: Job, file: ImportFile }, skipInvalid: boolean) {
  if (dryRun.file.mode !== 'dry_run') throw new ImportRefusedError('id', 'This import was already a commit; start a new dry run to import the file again', 409)
  if (dryRun.job.status !== 'succeeded') throw new ImportRefusedError('id', 'Wait for the dry run to finish before importing', 409)
  const { fileName, objectKey, sizeBytes, sha256, rowCount } = dryRun.file
  return queueImport(db, actor, { clientId: dryRun.job.clientId!, mode: 'commit', skipInvalid, dryRunId: dryRun.job.id, fileName, objectKey, sizeBytes, sha256, rowCount })
}

interface QueuedFile {
  clientId: number
  mode: 'dry_run' | 'commit'
  skipInvalid: boolean
  dryRunId: number | null
  fileName: string
  objectKey: string
  sizeBytes: number
  sha256: string
  rowCount: number
}

async function queueImport(db: Sequelize, actor: Actor, f: QueuedFile) {
  const job = await db.transaction(async (transaction) => {
    const job = await createJob({ workspaceId: actor.workspaceId, clientId: f.clientId, kind: 'import', params: { mode: f.mode }, createdBy: actor.id, progressTotal: f.rowCount }, transaction)
    await ImportFile.create({ jobId: job.id, mode: f.mode, skipInvalid: f.skipInvalid, dryRunId: f.dryRunId, fileName: f.fileName, objectKey: f.objectKey,
      sizeBytes: f.sizeBytes, sha256: f.sha256, rowCount: f.rowCount }, { transaction })
    await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: f.mode === 'commit' ? 'import.commit_started' : 'import.dry_run_started',
      entity: 'import', entityId: job.id, detail: { fileName: f.fileName, rows: f.rowCount, skipInvalid: f.skipInvalid } }, transaction)
    return job
  })
  await enqueueJob(db, job)
  return job
}

class DryRunDone extends Error {}

/**
 * The import job: streams the file from S3 through csv-parse, batch by batch, in one transaction.
 * A dry run is the very same pass, rolled back at the end, so its counts are what a commit would do.
 */
export async function runImport(db: Sequelize, ctx: JobContext) {
  const job = ctx.job
  const file = (await ImportFile.findByPk(job.id))!
  // A resumed attempt starts from the top, so the problems of an interrupted one go.
  await db.query('DELETE FROM import_row_errors WHERE job_id = :id', { replacements: { id: job.id } })
  let kept = 0
  const keepProblems = async (problems: ImportRowError[]) => {
    const room = problems.slice(0, Math.max(0, KEPT_PROBLEMS - kept))
    kept += room.length
    if (!room.length) return
    await db.query(`INSERT INTO import_row_errors (job_id, row_number, column_name, message) SELECT $1, * FROM unnest($2::int[], $3::text[], $4::text[])`,
      { bind: [job.id, room.map(p => p.row), room.map(p => p.column), room.map(p => p.message)] })
  }
  let batcher: ImportBatcher | null = null
  const object = await getObject(file.objectKey)
  const parser = object.body.pipe(csvParser())
  // pipe() does not pass a broken download on; the parser must fail rather than wait forever.
  object.body.on('error', err => parser.destroy(err))
  try {
    await db.transaction(async (transaction) => {
      await db.query('SET CONSTRAINTS coverings_last_inspection DEFERRED', { transaction })
      let batch: Array<{ row: number, cells: string[] }> = []
      let row = 1
      const flush = async () => {
        await batcher!.addBatch(batch, transaction)
        batch = []
        await ctx.checkpoint(row - 1, { ...batcher!.counts })
      }
      for await (const cells of parser as AsyncIterable<string[]>) {
        if (!batcher) {
          const header = mapHeader(cells)
          if ('error' in header) throw new JobFailed(`The file's ${header.error}`)
          batcher = new ImportBatcher(db, header.map, { id: job.id, workspaceId: job.workspaceId, clientId: job.clientId!, fileName: file.fileName }, keepProblems)
          continue
        }
        row++
        if (cells.every(c => c.trim() === '')) continue
        batch.push({ row, cells })
        if (batch.length === IMPORT_BATCH) await flush()
      }
      if (!batcher) throw new JobFailed('The file is empty.')
      if (batch.length) await flush()
      const counts = batcher.counts
      if (file.mode === 'dry_run') throw new DryRunDone()
      if (counts.badRows && !file.skipInvalid) {
        throw new JobFailed(`${counts.badRows.toLocaleString('en-GB')} of ${counts.rows.toLocaleString('en-GB')} rows have problems, so nothing was imported. Correct them and import again, or choose to skip the bad rows.`)
      }
      counts.written = true
      await logActivity({ workspaceId: job.workspaceId, userId: job.createdBy, action: 'import.committed', entity: 'import', entityId: job.id,
        detail: { fileName: file.fileName, sha256: file.sha256, skippedRows: counts.badRows, coverings: counts.coverings, inspections: counts.inspections } }, transaction)
    })
  }
  catch (err) {
    if (!(err instanceof DryRunDone)) {
      if (batcher) await recordBadRows(db, job.id, batcher)
      if ((err as { code?: string }).code?.startsWith('CSV_')) throw new JobFailed(`The import stopped: ${csvProblem(err)}. Nothing was imported.`)
      throw err
    }
  }
  finally {
    object.body.destroy()
  }
  await recordBadRows(db, job.id, batcher!)
  return { ...batcher!.counts }
}

async function recordBadRows(db: Sequelize, jobId: number, batcher: ImportBatcher) {
  await db.query('UPDATE imports SET bad_row_count = :bad, error_count = :problems WHERE job_id = :jobId',
    { replacements: { jobId, bad: batcher.counts.badRows, problems: batcher.counts.problems } })
  await db.query('UPDATE jobs SET counts = CAST(:counts AS jsonb) WHERE id = :jobId', { replacements: { jobId, counts: JSON.stringify(batcher.counts) } })
}

// ----- reading imports back -----

const importSelect = `j.id, cl.name AS "clientName", us.name AS "createdByName", im.mode, im.skip_invalid AS "skipInvalid", im.dry_run_id AS "dryRunId",
  im.file_name AS "fileName", im.size_bytes AS "sizeBytes", im.sha256, im.row_count AS "rowCount", im.bad_row_count AS "badRowCount", im.error_count AS "errorCount"`
const importFrom = 'jobs j JOIN imports im ON im.job_id = j.id LEFT JOIN clients cl ON cl.id = j.client_id LEFT JOIN users us ON us.id = j.created_by'

type ImportExtra = Omit<ImportSummary, keyof ReturnType<typeof jobJson>>
function importJson(job: Job, extra: ImportExtra & { createdByName: string | null }): ImportSummary {
  const { createdByName, ...rest } = extra
  return { ...jobJson(job, { createdByName }), ...rest }
}

/** The imports an actor may see: their workspace's, and a manager only their client's. */
export async function listImports(db: Sequelize, actor: Actor, q: { page: number, pageSize: number, sort: string, q?: string, mode?: 'dry_run' | 'commit' }): Promise<ListResult<ImportSummary>> {
  const where = ['j.workspace_id = :ws', `j.kind = 'import'`]
  const replacements: Record<string, unknown> = { ws: actor.workspaceId }
  const limit = clientLimit(actor)
  if (limit !== undefined) { where.push('j.client_id = :clientId'); replacements.clientId = limit }
  if (q.mode) { where.push('im.mode = :mode'); replacements.mode = q.mode }
  if (q.q) { where.push('im.file_name ILIKE :q'); replacements.q = `%${q.q.replace(/[\\%_]/g, m => `\\${m}`)}%` }
  const order = orderBy(q.sort, { createdAt: 'j.created_at', fileName: 'im.file_name', status: 'j.status' }, 'j.id DESC')
  const { items: rows, ...page } = await paged<ImportExtra & { id: number, createdByName: string | null }>(db, importSelect, importFrom, where, order, replacements, q)
  const jobs = new Map((await Job.findAll({ where: { id: rows.map(r => r.id) } })).map(j => [j.id, j]))
  return { items: rows.map(({ id, ...extra }) => importJson(jobs.get(id)!, extra)), ...page }
}

export async function getImport(db: Sequelize, job: Job): Promise<ImportDetail> {
  const [extra] = await db.query<ImportExtra & { createdByName: string | null }>(`SELECT ${importSelect} FROM ${importFrom} WHERE j.id = :id`, { type: QueryTypes.SELECT, replacements: { id: job.id } })
  const { items, total } = await listImportErrors(db, job.id, { page: 1, pageSize: 100, sort: 'row' })
  const { id: _id, ...rest } = extra as ImportExtra & { createdByName: string | null, id: number }
  return { ...importJson(job, rest), rowErrors: items, rowErrorsKept: total }
}

export async function listImportErrors(db: Sequelize, jobId: number, q: { page: number, pageSize: number, sort: string, column?: string }): Promise<ListResult<ImportRowError>> {
  const where = ['job_id = :jobId', ...(q.column ? ['column_name = :column'] : [])]
  return paged<ImportRowError>(db, 'row_number AS row, column_name AS "column", message', 'import_row_errors', where,
    `row_number ${q.sort === '-row' ? 'DESC' : 'ASC'}, id`, { jobId, column: q.column }, q)
}
