// Speed of a re-check: `npx tsx scripts/bench/recheck.ts [coverings]` (default 100,000), with DATABASE_URL exported
// (what `node scripts/run.mjs services dev` prints). Builds a scratch database next to DATABASE_URL's
// (tautline_bench_recheck, dropped and made afresh each run) holding a workspace of measured coverings, then in two
// rounds times the re-check job of the whole workspace (read each covering's last measurements, run the rulebook,
// store a check result per covering, move changed verdicts) against the plain SQL baseline: a SELECT of the same
// measurements and one bulk INSERT of the same results. Each part runs, bundled to plain JavaScript, in a process
// of its own. Prints; never fails on time.
import { fileURLToPath } from 'node:url'
import { parseArgs } from 'node:util'
import pg from 'pg'
import { checkRecord, coveringRecordSchema } from '../../rules/index'
import { createSequelize } from '../../server/db'
import { pushColumns } from '../../server/services/pg-copy'
import { createJob, runJob } from '../../server/services/jobs'
import { classifyChange, RECHECK_BATCH, recheckRecord, runRecheck } from '../../server/services/rechecks'
import { benchTenant, bundled, copyInto, mb, measured, pickMix, runPart, scratchDatabase, sec, seeded } from './jobs-common'

const GOALS = { ratio: 1.5 }
const script = fileURLToPath(import.meta.url)
const { values, positionals } = parseArgs({ allowPositionals: true, options: { part: { type: 'string' }, url: { type: 'string' }, workspace: { type: 'string' }, user: { type: 'string' } } })

const measurementsSql = `SELECT c.id, c.site_id AS "siteId", c.ref, c.product_type AS "productType", c.control, c.made_to AS "madeTo",
    to_char(c.installed_on, 'YYYY-MM-DD') AS "installedOn", c.manufactured_on AS "manufacturedOn", c.last_verdict AS "lastVerdict",
    c.last_inspection_id AS "inspectionId", i.record, s.jurisdiction, s.premises, o.childrens_room AS "childrensRoom"
  FROM coverings c JOIN sites s ON s.id = c.site_id JOIN openings o ON o.id = c.opening_id JOIN inspections i ON i.id = c.last_inspection_id
  WHERE s.workspace_id = $1 AND c.status = 'in_place'`

/** A workspace of measured coverings: 2 per opening, 2 openings per unit, 250 units per site, each with its last inspection. */
async function build(url: string, coverings: number) {
  const db = createSequelize(url, { poolMax: 2 })
  const { workspace, client, actor } = await benchTenant(db, 'Bench recheck')
  await db.close()
  const c = new pg.Client({ connectionString: url })
  await c.connect()
  const sites = Math.ceil(coverings / 1000)
  const jurisdictions = ['AU', 'CA', 'US', 'EU']
  await c.query(`INSERT INTO sites (workspace_id, client_id, ref, name, address, jurisdiction, premises)
    SELECT $1, $2, 'S' || n, 'Bench Court ' || n, n || ' Bench Road', (ARRAY['AU','CA','US','EU'])[n % 4 + 1], 'rental_home' FROM generate_series(0, $3 - 1) n`, [workspace.id, client.id, sites])
  await c.query(`INSERT INTO units (site_id, ref, name) SELECT s.id, 'U' || n, 'Unit ' || n FROM sites s, generate_series(0, 249) n WHERE s.workspace_id = $1`, [workspace.id])
  await c.query(`INSERT INTO openings (site_id, unit_id, ref, room) SELECT u.site_id, u.id, 'W' || n, 'Room ' || n FROM units u JOIN sites s ON s.id = u.site_id, generate_series(0, 1) n WHERE s.workspace_id = $1`, [workspace.id])
  const openings = (await c.query(`SELECT o.id, o.site_id, s.jurisdiction FROM openings o JOIN sites s ON s.id = o.site_id WHERE s.workspace_id = $1 ORDER BY o.id`, [workspace.id])).rows
  const ids = async (seq: string) => (await c.query(`SELECT nextval('${seq}')::int AS id FROM generate_series(1, $1)`, [coverings])).rows.map(r => r.id as number)
  const [coveringIds, inspectionIds] = [await ids('coverings_id_seq'), await ids('inspections_id_seq')]
  const random = seeded(0x7ec4)
  const coveringRows: unknown[][] = []
  const inspectionRows: unknown[][] = []
  const at = new Date('2026-06-02T00:00:00Z')
  for (let i = 0; i < coverings; i++) {
    const o = openings[Math.floor(i / 2) % openings.length]
    const mix = pickMix(random)
    const record = coveringRecordSchema.parse({ ref: `C${i}`, jurisdiction: o.jurisdiction, premises: 'rental_home', productType: mix.product, control: mix.control,
      madeTo: 'custom', installedOn: '2025-03-14', manufacturedOn: '2025-02', childrensRoom: false, ...mix.measures })
    const result = checkRecord(record, { today: '2026-06-02' })
    coveringRows.push([coveringIds[i], o.site_id, o.id, `C${i}`, mix.product, mix.control, 'custom', '2025-03-14', '2025-02', result.verdict, at])
    inspectionRows.push([inspectionIds[i], workspace.id, o.site_id, coveringIds[i], 'fitting', at, record, result.rulesVersion, result.verdict])
  }
  await copyInto(c, 'coverings', ['id', 'site_id', 'opening_id', 'ref', 'product_type', 'control', 'made_to', 'installed_on', 'manufactured_on', 'last_verdict', 'last_inspected_at'], coveringRows)
  // Findings are left out: a re-check reads only the inspection's record.
  await copyInto(c, 'inspections', ['id', 'workspace_id', 'site_id', 'covering_id', 'kind', 'inspected_at', 'record', 'rules_version', 'verdict'], inspectionRows)
  await c.query(`UPDATE coverings c SET last_inspection_id = i.id FROM inspections i WHERE i.covering_id = c.id AND i.workspace_id = $1`, [workspace.id])
  await c.query('VACUUM ANALYZE')
  await c.end()
  return { workspaceId: workspace.id, userId: actor.id, sites, jurisdictions }
}

/** The re-check job as the queue runs it. */
async function recheckPart() {
  const db = createSequelize(values.url!, { poolMax: 4 })
  const job = await createJob({ workspaceId: Number(values.workspace), clientId: null, kind: 'recheck', params: { scope: 'workspace', scopeId: null }, createdBy: Number(values.user) })
  const run = await measured(async () => {
    await runJob(db, job.id, runRecheck)
    await job.reload()
    return { status: job.status, error: job.error, counts: job.counts }
  })
  await db.close()
  console.log(JSON.stringify({ ...run, maxRssMb: process.resourceUsage().maxRSS / 1024 }))
}

/** Plain SQL: one SELECT of the same measurements, and one INSERT of the same results (worked out, untimed, in between). */
async function baselinePart() {
  const c = new pg.Client({ connectionString: values.url! })
  await c.connect()
  const [{ id: jobId }] = (await c.query(`INSERT INTO jobs (workspace_id, kind, status, created_by, finished_at) VALUES ($1, 'recheck', 'succeeded', $2, now()) RETURNING id`,
    [Number(values.workspace), Number(values.user)])).rows
  const select = await measured(async () => (await c.query(measurementsSql, [Number(values.workspace)])).rows)
  const out: unknown[][] = Array.from({ length: 10 }, () => [])
  for (const row of select.result) {
    const result = checkRecord(recheckRecord(row), { today: new Date().toISOString().slice(0, 10) })
    const failed = result.findings.filter(f => f.verdict === 'fail').map(f => f.clause)
    const missing = result.findings.filter(f => f.verdict === 'missing' && f.field).map(f => f.field)
    pushColumns(out, [jobId, row.siteId, row.id, row.inspectionId, result.rulesVersion, result.verdict, row.lastVerdict, classifyChange(row.lastVerdict, result.verdict), failed.join(' '), missing.join(' ')])
  }
  const insert = await measured(() => c.query(`INSERT INTO check_results (job_id, site_id, covering_id, inspection_id, rules_version, verdict, previous_verdict, change, failed_clauses, missing_fields)
    SELECT k.job_id, k.site_id, k.covering_id, k.inspection_id, k.version, k.verdict, k.previous, k.change, string_to_array(k.failed, ' '), string_to_array(k.missing, ' ')
    FROM unnest($1::int[], $2::int[], $3::int[], $4::int[], $5::text[], $6::text[], $7::text[], $8::text[], $9::text[], $10::text[])
      k(job_id, site_id, covering_id, inspection_id, version, verdict, previous, change, failed, missing)`, out))
  await c.end()
  console.log(JSON.stringify({ ms: select.ms + insert.ms, selectMs: select.ms, insertMs: insert.ms, rows: select.result.length, peakRssMb: Math.max(select.peakRssMb, insert.peakRssMb) }))
}

interface Part { ms: number, peakRssMb: number, result?: { status: string, error: string | null, counts: Record<string, unknown> }, selectMs?: number, insertMs?: number, rows?: number }

async function main() {
  const coverings = Number(positionals[0] ?? 100_000)
  if (!Number.isInteger(coverings) || coverings <= 0) {
    console.error('usage: tsx scripts/bench/recheck.ts [coverings]')
    process.exit(2)
  }
  const url = await scratchDatabase('tautline_bench_recheck')
  console.log(`re-check benchmark: ${coverings.toLocaleString('en-GB')} measured coverings in one workspace (batches of ${RECHECK_BATCH}), scratch database tautline_bench_recheck`)
  const t0 = performance.now()
  const built = await build(url, coverings)
  console.log(`built ${built.sites} sites in ${sec(performance.now() - t0)} (not timed below)`)
  const bundle = bundled(script)
  const args = (part: string) => ['--part', part, '--url', url, '--workspace', String(built.workspaceId), '--user', String(built.userId)]
  const rounds: Array<{ recheck: Part, baseline: Part }> = []
  for (const round of [1, 2]) {
    // The second round runs the parts the other way round, so neither always meets the larger check_results table.
    const order = round === 1 ? ['baseline', 'recheck'] : ['recheck', 'baseline']
    const out: Record<string, Part> = {}
    for (const part of order) out[part] = runPart<Part>(bundle, args(part))
    if (out.recheck!.result!.status !== 'succeeded') throw new Error(`the re-check did not succeed: ${out.recheck!.result!.error}`)
    rounds.push({ recheck: out.recheck!, baseline: out.baseline! })
  }
  const counts = rounds[0]!.recheck.result!.counts as { checked: number, unchanged: number, rulesVersions: string[] }
  console.log(`each re-check checked ${counts.checked.toLocaleString('en-GB')} coverings (${counts.unchanged.toLocaleString('en-GB')} unchanged) under ${counts.rulesVersions.join(', ')}`)
  console.log('round  re-check   peak RSS   baseline (SELECT + INSERT)        ratio')
  rounds.forEach((r, i) => {
    console.log(`${String(i + 1).padEnd(7)}${sec(r.recheck.ms).padStart(8)}   ${mb(r.recheck.peakRssMb).padStart(8)}   ${sec(r.baseline.ms).padStart(7)} (${sec(r.baseline.selectMs!)} + ${sec(r.baseline.insertMs!)})`.padEnd(70)
      + `${(r.recheck.ms / r.baseline.ms).toFixed(2)}×`)
  })
  const ratio = rounds.reduce((n, r) => n + r.recheck.ms, 0) / rounds.reduce((n, r) => n + r.baseline.ms, 0)
  console.log(`re-check / baseline over both rounds: ${ratio.toFixed(2)}× (goal ≤ ${GOALS.ratio}×) ${ratio <= GOALS.ratio ? 'met' : 'NOT met'}`)
  console.log(`coverings per second: re-check ${Math.round(coverings / (rounds[0]!.recheck.ms / 1000)).toLocaleString('en-GB')}, baseline ${Math.round(coverings / (rounds[0]!.baseline.ms / 1000)).toLocaleString('en-GB')}`)
}

if (values.part === 'recheck') await recheckPart()
else if (values.part === 'baseline') await baselinePart()
else await main()
