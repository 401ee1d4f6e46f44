import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { buildRecord, checkRecord, parseCoveringRecord, registerFactsOf } from '../../rules'
import type { CheckOptions, CoveringRecord } from '../../rules'
import { Client, Job, Site } from '../models'
import type { CheckChange, CheckChangeRow, RecheckCounts, RecheckScope, RecheckSummary } from '../../shared/types/jobs'
import type { Verdict } from '../../shared/types/register'
import type { ListResult } from '../../shared/schemas/common'
import { logActivity } from './activity'
import { paged } from './paged'
import { pushColumns } from './pg-copy'
import { JobFailed, createJob, enqueueJob, jobJson } from './jobs'
import type { JobContext } from './jobs'
import { ruleSetFixture } from './rule-fixtures'
import { clientLimit } from './scope'
import type { Actor } from './scope'

// A re-check runs every measured covering of a site, client or workspace through the current rule sets.
// It stores one check result per covering, pointing at the inspection whose record it used (as measured and
// recorded then, never today's register row), and moves the covering's current verdict; it never makes an
// inspection up.

export const RECHECK_BATCH = 1000

interface Params { scope: RecheckScope, scopeId: number | null, ruleSetFixture?: string | null }

export async function createRecheck(db: Sequelize, actor: Actor, target: { scope: 'site', site: Site } | { scope: 'client', client: Client } | { scope: 'workspace' },
  ruleSetFixtureName: string | null) {
  const scopeId = target.scope === 'site' ? target.site.id : target.scope === 'client' ? target.client.id : null
  const clientId = target.scope === 'site' ? target.site.clientId : target.scope === 'client' ? target.client.id : null
  const params: Params = { scope: target.scope, scopeId, ruleSetFixture: ruleSetFixtureName }
  const job = await db.transaction(async (transaction) => {
    const job = await createJob({ workspaceId: actor.workspaceId, clientId, siteId: target.scope === 'site' ? target.site.id : null, kind: 'recheck',
      params: params as unknown as Record<string, unknown>, createdBy: actor.id }, transaction)
    await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: 'recheck.started', entity: 'recheck', entityId: job.id, detail: { ...params } }, transaction)
    return job
  })
  await enqueueJob(db, job)
  return job
}

function scopeSql(job: Job) {
  const p = job.params as unknown as Params
  if (p.scope === 'site') return { sql: 's.workspace_id = :ws AND c.site_id = :scopeId', replacements: { ws: job.workspaceId, scopeId: p.scopeId } }
  if (p.scope === 'client') return { sql: 's.workspace_id = :ws AND s.client_id = :scopeId', replacements: { ws: job.workspaceId, scopeId: p.scopeId } }
  return { sql: 's.workspace_id = :ws', replacements: { ws: job.workspaceId } }
}

export function classifyChange(previous: string | null, verdict: string): CheckChange {
  if (previous === verdict) return 'unchanged'
  if (verdict === 'non_compliant') return 'newly_failing'
  if (verdict === 'compliant') return 'newly_passing'
  if (verdict === 'incomplete') return 'now_incomplete'
  return 'other'
}

interface Row {
  id: number
  siteId: number
  lastVerdict: string | null
  inspectionId: number
  inspectedOn: string
  record: Record<string, unknown>
}

/**
 * The rulebook record exactly as the named inspection measured and recorded it: product, control, dates,
 * premises and room included. Today's register row never enters it: an edit since then marks the covering
 * for a new inspection instead.
 */
export function recheckRecord(row: Pick<Row, 'record'>): CoveringRecord {
  // Built and parsed as a sign-off builds it (rules/build.ts), with the stored record as its own register; a field
  // added to the record since is null (not recorded).
  const parsed = parseCoveringRecord(buildRecord(registerFactsOf(row.record), row.record))
  if (!parsed.success) throw new Error(`stored record cannot be read: ${parsed.error.issues[0]?.path.join('.')}`)
  return parsed.data
}

export async function runRecheck(db: Sequelize, ctx: JobContext) {
  const job = ctx.job
  const params = job.params as unknown as Params
  let options: CheckOptions = { today: new Date().toISOString().slice(0, 10) }
  if (params.ruleSetFixture) {
    try {
      options = { ...options, ruleSets: ruleSetFixture(params.ruleSetFixture) }
    }
    catch (err) {
      throw new JobFailed((err as Error).message)
    }
  }
  const scope = scopeSql(job)
  const from = `coverings c JOIN sites s ON s.id = c.site_id`
  const [totals] = await db.query<{ measured: number, notMeasured: number }>(`SELECT count(*) FILTER (WHERE c.last_inspection_id IS NOT NULL)::int AS measured,
      count(*) FILTER (WHERE c.last_inspection_id IS NULL)::int AS "notMeasured" FROM ${from} WHERE ${scope.sql} AND c.status = 'in_place'`,
  { type: QueryTypes.SELECT, replacements: scope.replacements })
  const counts: RecheckCounts = { checked: 0, notMeasured: totals!.notMeasured, unreadable: 0, newlyFailing: 0, newlyPassing: 0, nowIncomplete: 0, otherChanges: 0, unchanged: 0, rulesVersions: [] }
  const versions = new Set<string>()
  const tally: Record<CheckChange, keyof RecheckCounts> = { newly_failing: 'newlyFailing', newly_passing: 'newlyPassing', now_incomplete: 'nowIncomplete', other: 'otherChanges', unchanged: 'unchanged' }
  await ctx.checkpoint(0, { ...counts }, totals!.measured)
  await db.transaction(async (transaction) => {
    let after = 0
    for (;;) {
      const rows = await db.query<Row>(`SELECT c.id, c.site_id AS "siteId", c.last_verdict AS "lastVerdict", c.last_inspection_id AS "inspectionId", i.record,
          to_char(i.inspected_at AT TIME ZONE 'UTC', 'YYYY-MM-DD') AS "inspectedOn"
        FROM ${from} JOIN inspections i ON i.id = c.last_inspection_id
        WHERE ${scope.sql} AND c.status = 'in_place' AND c.id > :after ORDER BY c.id LIMIT ${RECHECK_BATCH}`,
      { type: QueryTypes.SELECT, replacements: { ...scope.replacements, after }, transaction })
      if (!rows.length) break
      const out: unknown[][] = Array.from({ length: 9 }, () => [])
      const moved: unknown[][] = [[], [], []]
      for (const row of rows) {
        let result: ReturnType<typeof checkRecord>
        try {
          // As of the inspection's day, as the inspection itself was checked: the same rule set gives the same verdict.
          result = checkRecord(recheckRecord(row), { ...options, today: row.inspectedOn })
        }
        catch {
          // A register value the rulebook does not know (written around the API): reported, never guessed.
          counts.unreadable++
          continue
        }
        const change = classifyChange(row.lastVerdict, result.verdict)
        ;(counts[tally[change]] as number)++
        versions.add(result.rulesVersion)
        const failed: string[] = []
        const missingFields: string[] = []
        for (const f of result.findings) {
          if (f.verdict === 'fail') failed.push(f.clause)
          else if (f.verdict === 'missing' && f.field) missingFields.push(f.field)
        }
        pushColumns(out, [row.siteId, row.id, row.inspectionId, result.rulesVersion, result.verdict, row.lastVerdict, change, failed.join(' '), missingFields.join(' ')])
        if (change !== 'unchanged') pushColumns(moved, [row.id, result.verdict, row.inspectionId])
      }
      counts.checked += out[0]!.length
      await db.query(`INSERT INTO check_results (job_id, site_id, covering_id, inspection_id, rules_version, verdict, previous_verdict, change, failed_clauses, missing_fields)
        SELECT $1, k.site_id, k.covering_id, k.inspection_id, k.version, k.verdict, k.previous, k.change, string_to_array(k.failed, ' '), string_to_array(k.missing, ' ')
        FROM unnest($2::int[], $3::int[], $4::int[], $5::text[], $6::text[], $7::text[], $8::text[], $9::text[], $10::text[])
          k(site_id, covering_id, inspection_id, version, verdict, previous, change, failed, missing)`, { bind: [job.id, ...out], transaction })
      // Only while the covering still points at the measurements used: a fitting saved meanwhile wins.
      if (moved[0]!.length) {
        await db.query(`UPDATE coverings c SET last_verdict = k.verdict, updated_at = now() FROM unnest($1::int[], $2::text[], $3::int[]) k(id, verdict, inspection_id)
          WHERE c.id = k.id AND c.last_inspection_id = k.inspection_id`, { bind: moved, transaction })
      }
      after = rows[rows.length - 1]!.id
      counts.rulesVersions = [...versions].sort()
      await ctx.checkpoint(counts.checked + counts.unreadable, { ...counts })
    }
    await logActivity({ workspaceId: job.workspaceId, userId: job.createdBy, action: 'recheck.finished', entity: 'recheck', entityId: job.id,
      detail: { ...params, ...counts } }, transaction)
  })
  return { ...counts }
}

// ----- reading re-checks back -----

async function scopeName(job: Job) {
  const p = job.params as unknown as Params
  if (p.scope === 'site') return (await Site.findByPk(p.scopeId!))?.name ?? 'a site'
  if (p.scope === 'client') return (await Client.findByPk(p.scopeId!))?.name ?? 'a client'
  return 'the whole workspace'
}

export async function recheckJson(db: Sequelize, job: Job): Promise<RecheckSummary> {
  const p = job.params as unknown as Params
  const [by] = await db.query<{ name: string }>('SELECT name FROM users WHERE id = :id', { type: QueryTypes.SELECT, replacements: { id: job.createdBy } })
  return { ...jobJson(job, { createdByName: by?.name ?? null }), scope: p.scope, scopeId: p.scopeId, scopeName: await scopeName(job) }
}

export async function listRechecks(db: Sequelize, actor: Actor, q: { page: number, pageSize: number, siteId?: number }): Promise<ListResult<RecheckSummary>> {
  const where: Record<string, unknown> = { workspaceId: actor.workspaceId, kind: 'recheck' }
  const limit = clientLimit(actor)
  if (limit !== undefined) where.clientId = limit
  if (q.siteId) where.siteId = q.siteId
  const { rows, count } = await Job.findAndCountAll({ where, order: [['createdAt', 'DESC'], ['id', 'DESC']], limit: q.pageSize, offset: (q.page - 1) * q.pageSize })
  return { items: await Promise.all(rows.map(j => recheckJson(db, j))), total: count, page: q.page, pageSize: q.pageSize }
}

export async function listCheckChanges(db: Sequelize, jobId: number, q: { page: number, pageSize: number, change?: CheckChange }): Promise<ListResult<CheckChangeRow>> {
  const where = ['r.job_id = :jobId', q.change ? 'r.change = :change' : `r.change <> 'unchanged'`]
  const replacements = { jobId, change: q.change }
  const from = `check_results r JOIN coverings c ON c.id = r.covering_id JOIN sites s ON s.id = r.site_id JOIN openings o ON o.id = c.opening_id
    JOIN units u ON u.id = o.unit_id JOIN inspections i ON i.id = r.inspection_id`
  return paged<CheckChangeRow & { previousVerdict: Verdict | null }>(db, `r.covering_id AS "coveringId", c.ref AS "coveringRef", r.site_id AS "siteId", s.name AS "siteName",
        u.ref AS "unitRef", o.room, r.previous_verdict AS "previousVerdict", r.verdict, r.change, r.rules_version AS "rulesVersion", r.inspection_id AS "inspectionId",
        i.inspected_at AS "inspectedAt", r.failed_clauses AS "failedClauses", r.missing_fields AS "missingFields"`,
  from, where, `array_position(ARRAY['newly_failing','now_incomplete','newly_passing','other','unchanged'], r.change), c.ref, r.id`, replacements, q, 'check_results r')
}
