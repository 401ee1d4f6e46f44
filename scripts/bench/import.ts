// Speed and memory of a CSV import: `npx tsx scripts/bench/import.ts [rows]` (default 20,000), with the variables
// printed by `node scripts/run.mjs services dev` exported (DATABASE_URL, S3_*). Builds a scratch database next to
// DATABASE_URL's (tautline_bench_import, dropped and made afresh each run), generates a file of measured coverings,
// and in two rounds times the import (read and check the upload, store it in S3, then the job: stream it back
// through csv-parse, check every row and write it) against the plain SQL baseline: COPY of the same rows into the
// same tables. Each part runs, bundled to plain JavaScript, in a process of its own, so its peak memory is its own.
// Three rounds, alternating which part goes first. Prints; never fails on time.
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { parseArgs } from 'node:util'
import { fileURLToPath } from 'node:url'
import { randomUUID } from 'node:crypto'
import { parse } from 'csv-parse/sync'
import { stringify } from 'csv-stringify/sync'
import pg from 'pg'
import { checkRecord, coveringRecordSchema } from '../../rules/index'
import { createSequelize } from '../../server/db'
import { ImportFile } from '../../server/models'
import { rulebookInput } from '../../server/services/inspections'
import { IMPORT_BATCH, runImport, surveyCsv } from '../../server/services/imports'
import { createJob, runJob } from '../../server/services/jobs'
import { daysToRemedy, remedyPriority } from '../../server/services/fixes'
import { putObject } from '../../server/services/storage'
import { importColumns, mapHeader, measurementColumns, readRow } from '../../shared/schemas/imports'
import type { ImportRow } from '../../shared/schemas/imports'
import { benchTenant, bundled, copyInto, mb, measured, pickMix, runPart, scratchDatabase, sec, seeded } from './jobs-common'

const GOALS = { ratio: 2, peakRssMb: 256 }
const script = fileURLToPath(import.meta.url)
const { values, positionals } = parseArgs({ allowPositionals: true, options: {
  part: { type: 'string' }, file: { type: 'string' }, url: { type: 'string' }, workspace: { type: 'string' }, client: { type: 'string' }, user: { type: 'string' },
} })

if (process.env.S3_ENDPOINT && !process.env.S3_ACCESS_KEY_ID && /\/\/(127\.0\.0\.1|localhost)[:/]/.test(process.env.S3_ENDPOINT)) {
  Object.assign(process.env, { S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_FORCE_PATH_STYLE: '1' })
}

/** A file of `rows` measured coverings: 2 per opening, 2 openings per unit, 125 units per site. */
function generate(rows: number, seed: number) {
  const random = seeded(seed)
  const header = importColumns.map(c => c.name)
  const out: string[][] = [header]
  for (let i = 0; i < rows; i++) {
    const site = Math.floor(i / 500), unit = Math.floor(i / 4) % 125, opening = Math.floor(i / 2) % 2
    const mix = pickMix(random)
    const cells: Record<string, string> = {
      site_ref: `S${site}`, site_name: `Bench Court ${site}`, address: `${site + 1} Bench Road, Kellerton NSW 2999`, jurisdiction: 'AU', premises: 'rental_home',
      unit_ref: `U${unit}`, unit_name: `Unit ${unit}`, opening_ref: `W${opening}`, room: opening ? 'Bedroom' : 'Living', covering_ref: `S${site}-C${i}`,
      product_type: mix.product, control: mix.control, made_to: 'custom', installed_on: '2025-03-14', manufactured_on: '2025-02', measured_on: '2026-06-02',
    }
    for (const c of measurementColumns) {
      const v = mix.measures[c.field!]
      if (v !== undefined && v !== null) cells[c.name] = c.kind === 'flag' ? (v ? 'yes' : 'no') : c.kind === 'length' ? `${v}mm` : String(v)
    }
    out.push(header.map(h => cells[h] ?? ''))
  }
  return stringify(out)
}

/** The import as a person starts it, minus HTTP: survey and store the upload, then run the job to its end. */
async function importPart() {
  const db = createSequelize(values.url!, { poolMax: 4 })
  // Held only while uploading, as the server holds the request's file.
  let data: Buffer | null = await readFile(values.file!)
  const run = await measured(async () => {
    const t0 = performance.now()
    const { rows } = await surveyCsv(data!)
    const objectKey = `bench/imports/${randomUUID()}.csv`
    await putObject(objectKey, data!, 'text/csv')
    const sizeBytes = data!.byteLength
    data = null
    const job = await createJob({ workspaceId: Number(values.workspace), clientId: Number(values.client), kind: 'import', params: { mode: 'commit' }, createdBy: Number(values.user), progressTotal: rows })
    await ImportFile.create({ jobId: job.id, mode: 'commit', skipInvalid: false, dryRunId: null, fileName: 'bench.csv', objectKey, sizeBytes, sha256: 'bench', rowCount: rows })
    const uploadMs = performance.now() - t0
    await runJob(db, job.id, runImport)
    await job.reload()
    return { uploadMs, status: job.status, error: job.error, counts: job.counts }
  })
  await db.close()
  console.log(JSON.stringify({ ...run, maxRssMb: process.resourceUsage().maxRSS / 1024 }))
}

/** The same rows, checked and laid out beforehand (not timed), then COPY into the same tables in one transaction. */
async function copyPart() {
  const client = new pg.Client({ connectionString: values.url! })
  await client.connect()
  const ws = Number(values.workspace), cl = Number(values.client)
  const records = parse(await readFile(values.file!)) as string[][]
  const header = mapHeader(records[0]!)
  if ('error' in header) throw new Error(header.error)
  const [{ id: jobId }] = (await client.query(`INSERT INTO jobs (workspace_id, client_id, kind, status, created_by, finished_at) VALUES ($1, $2, 'import', 'succeeded', $3, now()) RETURNING id`, [ws, cl, Number(values.user)])).rows
  await client.query(`INSERT INTO imports (job_id, mode, file_name, object_key, size_bytes, sha256, row_count) VALUES ($1, 'commit', 'bench.csv', 'bench', 1, 'bench', $2)`, [jobId, records.length - 1])
  const rows: ImportRow[] = records.slice(1).map((cells) => {
    const r = readRow(header.map, cells)
    if ('problems' in r) throw new Error(JSON.stringify(r.problems))
    return r.row
  })
  const reserve = async (seq: string, n: number) => (await client.query(`SELECT nextval('${seq}')::int AS id FROM generate_series(1, $1)`, [n])).rows.map(r => r.id as number)
  const keyed = (key: (r: ImportRow) => string) => [...new Map(rows.map(r => [key(r), r])).entries()]
  const sites = keyed(r => r.site_ref as string), units = keyed(r => `${r.site_ref}\t${r.unit_ref}`), openings = keyed(r => `${r.site_ref}\t${r.unit_ref}\t${r.opening_ref}`)
  const siteIds = new Map(sites.map(([k], i) => [k, i]))
  const [sIds, uIds, oIds, cIds, iIds] = [await reserve('sites_id_seq', sites.length), await reserve('units_id_seq', units.length), await reserve('openings_id_seq', openings.length),
    await reserve('coverings_id_seq', rows.length), await reserve('inspections_id_seq', rows.length)]
  const unitIds = new Map(units.map(([k], i) => [k, uIds[i]!]))
  const openingIds = new Map(openings.map(([k], i) => [k, oIds[i]!]))
  const copy: Record<string, unknown[][]> = { sites: [], units: [], openings: [], coverings: [], inspections: [], findings: [], fixes: [] }
  for (const [k, r] of sites) copy.sites!.push([sIds[siteIds.get(k)!], ws, cl, r.site_ref, r.site_name, r.address, r.jurisdiction, r.premises])
  for (const [k, r] of units) copy.units!.push([unitIds.get(k), sIds[siteIds.get(r.site_ref as string)!], r.unit_ref, r.unit_name])
  for (const [k, r] of openings) copy.openings!.push([openingIds.get(k), sIds[siteIds.get(r.site_ref as string)!], unitIds.get(`${r.site_ref}\t${r.unit_ref}`), r.opening_ref, r.room, false])
  rows.forEach((r, i) => {
    const siteId = sIds[siteIds.get(r.site_ref as string)!]
    const measurements: Record<string, unknown> = {}
    for (const c of measurementColumns) if (r[c.name] !== null) measurements[c.field!] = r[c.name]
    const covering = { ref: r.covering_ref, productType: r.product_type, control: r.control, madeTo: r.made_to, installedOn: r.installed_on, manufacturedOn: r.manufactured_on }
    const record = coveringRecordSchema.parse(rulebookInput({ jurisdiction: 'AU', premises: r.premises as string }, covering as Parameters<typeof rulebookInput>[1], measurements, { childrensRoom: false }))
    const result = checkRecord(record, { today: r.measured_on as string })
    const at = new Date(`${r.measured_on}T00:00:00Z`)
    copy.coverings!.push([cIds[i], siteId, openingIds.get(`${r.site_ref}\t${r.unit_ref}\t${r.opening_ref}`), r.covering_ref, r.product_type, r.control, r.made_to, r.installed_on, r.manufactured_on, iIds[i], result.verdict, at])
    copy.inspections!.push([iIds[i], ws, siteId, cIds[i], 'import', at, record, result.rulesVersion, result.verdict, `Imported from bench.csv, row ${i + 2}`, jobId, i + 2])
    for (const f of result.findings) {
      copy.findings!.push([iIds[i], f.clause, f.verdict, f.measured, f.limit, f.unit, f.field, f.source, f.basis, f.message, f.fix])
      if (f.verdict === 'fail') {
        const priority = remedyPriority(f.field, r.premises as string, false)
        copy.fixes!.push([ws, siteId, cIds[i], f.clause, iIds[i], f.message, f.fix, f.source, priority, new Date(at.getTime() + daysToRemedy[priority]! * 86_400_000).toISOString().slice(0, 10)])
      }
    }
  })
  const columns: Record<string, string> = {
    sites: 'id, workspace_id, client_id, ref, name, address, jurisdiction, premises', units: 'id, site_id, ref, name', openings: 'id, site_id, unit_id, ref, room, childrens_room',
    coverings: 'id, site_id, opening_id, ref, product_type, control, made_to, installed_on, manufactured_on, last_inspection_id, last_verdict, last_inspected_at',
    inspections: 'id, workspace_id, site_id, covering_id, kind, inspected_at, record, rules_version, verdict, notes, import_id, source_row',
    findings: 'inspection_id, clause, verdict, measured, limit_value, unit, field, source, basis, message, fix',
    fixes: 'workspace_id, site_id, covering_id, clause, raised_by_inspection_id, message, fix, source, priority, due_on',
  }
  const run = await measured(async () => {
    await client.query('BEGIN')
    // As the import does: coverings point at inspections copied after them, checked at commit.
    await client.query('SET CONSTRAINTS coverings_last_inspection DEFERRED')
    for (const [table, lines] of Object.entries(copy)) await copyInto(client, table, columns[table]!.split(', '), lines)
    await client.query('COMMIT')
    return Object.fromEntries(Object.entries(copy).map(([t, l]) => [t, l.length]))
  })
  await client.end()
  console.log(JSON.stringify({ ...run, maxRssMb: process.resourceUsage().maxRSS / 1024 }))
}

interface Part { ms: number, peakRssMb: number, maxRssMb: number, result: { uploadMs?: number, status?: string, error?: string | null, counts?: Record<string, unknown> } & Record<string, unknown> }

async function main() {
  const rows = Number(positionals[0] ?? 20_000)
  if (!Number.isInteger(rows) || rows <= 0) {
    console.error('usage: tsx scripts/bench/import.ts [rows]')
    process.exit(2)
  }
  const url = await scratchDatabase('tautline_bench_import')
  const db = createSequelize(url, { poolMax: 2 })
  const dir = await mkdtemp(join(tmpdir(), 'tautline-bench-'))
  console.log(`import benchmark: ${rows.toLocaleString('en-GB')} rows of measured coverings (batches of ${IMPORT_BATCH}), scratch database tautline_bench_import`)
  const bundle = bundled(script)
  const results: Array<{ round: number, imp: Part, copy: Part, sizeMb: number }> = []
  for (const round of [1, 2, 3]) {
    const file = join(dir, `round-${round}.csv`)
    const csv = generate(rows, 0x1a2b + round)
    await writeFile(file, csv)
    const [forImport, forCopy] = [await benchTenant(db, `Bench import ${round}`), await benchTenant(db, `Bench copy ${round}`)]
    const args = (t: typeof forImport, part: string) => ['--part', part, '--file', file, '--url', url, '--workspace', String(t.workspace.id), '--client', String(t.client.id), '--user', String(t.actor.id)]
    // Rounds alternate which part goes first, so neither always meets the larger tables or the busier moment.
    const order = round % 2 ? ['copy', 'import'] : ['import', 'copy']
    const out: Record<string, Part> = {}
    for (const part of order) out[part] = runPart<Part>(bundle, args(part === 'import' ? forImport : forCopy, part))
    if (out.import!.result.status !== 'succeeded') throw new Error(`the import did not succeed: ${out.import!.result.error}`)
    results.push({ round, imp: out.import!, copy: out.copy!, sizeMb: Buffer.byteLength(csv) / 1048576 })
  }
  await db.close()
  await rm(dir, { recursive: true, force: true })
  const counts = results[0]!.imp.result.counts as { coverings: { created: number }, inspections: { created: number }, units: { created: number } }
  console.log(`each file: ${results[0]!.sizeMb.toFixed(1)} MB; each import wrote ${counts.units.created.toLocaleString('en-GB')} units, ${counts.coverings.created.toLocaleString('en-GB')} coverings, ${counts.inspections.created.toLocaleString('en-GB')} inspections with their findings`)
  console.log('round  import (upload + job)        peak RSS   COPY baseline   ratio')
  for (const r of results) {
    console.log(`${String(r.round).padEnd(7)}${sec(r.imp.ms).padStart(7)} (${sec(r.imp.result.uploadMs!)} + ${sec(r.imp.ms - r.imp.result.uploadMs!)})`.padEnd(37)
      + `${mb(Math.max(r.imp.peakRssMb, r.imp.maxRssMb)).padStart(8)}   ${sec(r.copy.ms).padStart(13)}   ${(r.imp.ms / r.copy.ms).toFixed(2)}×`)
  }
  const importMs = results.reduce((n, r) => n + r.imp.ms, 0)
  const copyMs = results.reduce((n, r) => n + r.copy.ms, 0)
  const peak = Math.max(...results.map(r => Math.max(r.imp.peakRssMb, r.imp.maxRssMb)))
  const ratio = importMs / copyMs
  const median = results.map(r => r.imp.ms / r.copy.ms).sort((a, b) => a - b)[1]!
  console.log(`import / COPY over all rounds: ${ratio.toFixed(2)}× (median round ${median.toFixed(2)}×; goal ≤ ${GOALS.ratio}×) ${ratio <= GOALS.ratio ? 'met' : 'NOT met'}; `
    + `peak memory of the import process: ${mb(peak)} (goal ≤ ${GOALS.peakRssMb} MB) ${peak <= GOALS.peakRssMb ? 'met' : 'NOT met'}`)
  console.log(`rows per second: import ${Math.round((rows * 2) / (importMs / 1000)).toLocaleString('en-GB')}, COPY ${Math.round((rows * 2) / (copyMs / 1000)).toLocaleString('en-GB')}`)
}

if (values.part === 'import') await importPart()
else if (values.part === 'copy') await copyPart()
else await main()
