import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { Client, Unit, User, Workspace } from '../models'
import type { Site } from '../models'
import { DUE_SOON_DAYS } from '../../shared/schemas/portfolio'
import type { AuditRequest } from '../../shared/schemas/portfolio'
import type { ListResult } from '../../shared/schemas/common'
import type { DueState, PortfolioCoveringRow, PortfolioSummary, PortfolioUnitRow } from '../../shared/types/jobs'
import { logActivity } from './activity'
import { appUrl, sendRecordedMail } from './mail'
import { paged } from './paged'
import { countHits, envLimit, minutesText, refundHits } from './rate-limits'
import { clientLimit, likePattern, orderBy, siteScopeSql } from './scope'
import type { Actor } from './scope'
import { Refusal } from '../utils/refusal'

// The portfolio: a client's units and coverings with their verdicts and re-inspection due dates.
// A covering is due its client's interval (12 months unless set per client) after its last inspection.

const dueOn = `((c.last_inspected_at AT TIME ZONE 'UTC')::date + make_interval(months => cl.reinspect_interval_months))::date`
const dueState = `CASE WHEN c.last_inspected_at IS NULL THEN 'never' WHEN d.due < current_date THEN 'overdue'
  WHEN d.due <= current_date + ${DUE_SOON_DAYS} THEN 'due_soon' ELSE 'later' END`
const need = `CASE WHEN c.last_verdict = 'non_compliant' THEN 1 WHEN d.due < current_date THEN 2 WHEN c.last_verdict = 'incomplete' THEN 3
  WHEN c.last_verdict IS NULL THEN 4 WHEN d.due <= current_date + ${DUE_SOON_DAYS} THEN 5 ELSE 6 END`
const coveringFrom = `coverings c JOIN sites s ON s.id = c.site_id JOIN clients cl ON cl.id = s.client_id
  JOIN openings o ON o.id = c.opening_id JOIN units u ON u.id = o.unit_id CROSS JOIN LATERAL (SELECT ${dueOn} AS due) d`
const dueFilter: Record<DueState, string> = {
  overdue: 'd.due < current_date',
  due_soon: `d.due >= current_date AND d.due <= current_date + ${DUE_SOON_DAYS}`,
  later: `d.due > current_date + ${DUE_SOON_DAYS}`,
  never: 'c.last_inspected_at IS NULL',
}
const verdictFilter = (verdict: string) => (verdict === 'unchecked' ? 'c.last_verdict IS NULL' : 'c.last_verdict = :verdict')

interface Filters { siteId?: number, clientId?: number, verdict?: string, due?: DueState }

function scoped(actor: Actor, f: Filters) {
  const scope = siteScopeSql(actor)
  const where = [scope.sql]
  const replacements: Record<string, unknown> = { ...scope.replacements, verdict: f.verdict }
  if (f.siteId) { where.push('s.id = :siteId'); replacements.siteId = f.siteId }
  if (f.clientId) { where.push('s.client_id = :clientId'); replacements.clientId = f.clientId }
  return { where, replacements }
}

export async function portfolioSummary(db: Sequelize, actor: Actor, f: Filters): Promise<PortfolioSummary> {
  const { where, replacements } = scoped(actor, f)
  const [row] = await db.query<Omit<PortfolioSummary, 'clientName' | 'reinspectIntervalMonths'>>(`SELECT count(*)::int AS "coveringCount",
      count(*) FILTER (WHERE c.last_verdict = 'compliant')::int AS "compliantCount", count(*) FILTER (WHERE c.last_verdict = 'non_compliant')::int AS "nonCompliantCount",
      count(*) FILTER (WHERE c.last_verdict = 'incomplete')::int AS "incompleteCount", count(*) FILTER (WHERE c.last_verdict IS NULL)::int AS "uncheckedCount",
      count(*) FILTER (WHERE ${dueFilter.overdue})::int AS "overdueCount", count(*) FILTER (WHERE ${dueFilter.due_soon})::int AS "dueSoonCount",
      (SELECT count(*)::int FROM fixes fx JOIN sites s ON s.id = fx.site_id WHERE fx.status = 'open' AND ${where.join(' AND ')}) AS "openRemedies"
    FROM ${coveringFrom} WHERE ${where.join(' AND ')} AND c.status = 'in_place'`, { type: QueryTypes.SELECT, replacements })
  const clientId = clientLimit(actor) ?? f.clientId
  const client = clientId ? await Client.findOne({ where: { id: clientId, workspaceId: actor.workspaceId } }) : null
  return { ...row!, clientName: client?.name ?? null, reinspectIntervalMonths: client?.reinspectIntervalMonths ?? null }
}

export async function portfolioUnits(db: Sequelize, actor: Actor, q: Filters & { page: number, pageSize: number, sort: string, q?: string }): Promise<ListResult<PortfolioUnitRow>> {
  const { where, replacements } = scoped(actor, q)
  if (q.q) { where.push('(u.ref ILIKE :q OR u.name ILIKE :q OR s.name ILIKE :q)'); replacements.q = likePattern(q.q) }
  const having: string[] = []
  if (q.verdict) having.push(`count(c.id) FILTER (WHERE ${verdictFilter(q.verdict)}) > 0`)
  if (q.due) having.push(`count(c.id) FILTER (WHERE ${dueFilter[q.due]}) > 0`)
  const grouped = `SELECT u.id, u.ref, u.name, s.id AS "siteId", s.ref AS "siteRef", s.name AS "siteName",
      count(c.id)::int AS "coveringCount", count(c.id) FILTER (WHERE c.last_verdict = 'compliant')::int AS "compliantCount",
      count(c.id) FILTER (WHERE c.last_verdict = 'non_compliant')::int AS "nonCompliantCount",
      count(c.id) FILTER (WHERE c.last_verdict = 'incomplete')::int AS "incompleteCount",
      count(c.id) FILTER (WHERE c.id IS NOT NULL AND c.last_verdict IS NULL)::int AS "uncheckedCount",
      count(c.id) FILTER (WHERE ${dueFilter.overdue})::int AS "overdueCount", to_char(min(d.due), 'YYYY-MM-DD') AS "nextDueOn"
    FROM units u JOIN sites s ON s.id = u.site_id JOIN clients cl ON cl.id = s.client_id
      LEFT JOIN openings o ON o.unit_id = u.id LEFT JOIN coverings c ON c.opening_id = o.id AND c.status = 'in_place'
      LEFT JOIN LATERAL (SELECT ${dueOn} AS due) d ON true
    WHERE ${where.join(' AND ')} GROUP BY u.id, s.id ${having.length ? `HAVING ${having.join(' AND ')}` : ''}`
  const order = orderBy(q.sort, { ref: 'u.ref', site: 's.name', failing: '"nonCompliantCount"', due: '"nextDueOn"' }, '"overdueCount" DESC, s.name, u.ref, u.id')
  const [items, [count]] = await Promise.all([
    db.query<PortfolioUnitRow>(`${grouped} ORDER BY ${order} LIMIT :limit OFFSET :offset`,
      { type: QueryTypes.SELECT, replacements: { ...replacements, limit: q.pageSize, offset: (q.page - 1) * q.pageSize } }),
    db.query<{ total: number }>(`SELECT count(*)::int AS total FROM (${grouped}) g`, { type: QueryTypes.SELECT, replacements }),
  ])
  return { items, total: count?.total ?? 0, page: q.page, pageSize: q.pageSize }
}

export async function portfolioCoverings(db: Sequelize, actor: Actor, q: Filters & { unitId?: number, attention?: 'true' | 'false', page: number, pageSize: number, sort: string, q?: string }): Promise<ListResult<PortfolioCoveringRow>> {
  const { where, replacements } = scoped(actor, q)
  where.push(`c.status = 'in_place'`)
  if (q.unitId) { where.push('u.id = :unitId'); replacements.unitId = q.unitId }
  if (q.verdict) where.push(verdictFilter(q.verdict))
  if (q.due) where.push(dueFilter[q.due])
  if (q.attention === 'true') where.push(`${need} <= 5`)
  if (q.q) { where.push('(c.ref ILIKE :q OR u.ref ILIKE :q OR o.room ILIKE :q)'); replacements.q = likePattern(q.q) }
  // Within one need, the longest-overdue first, then by reference.
  const order = orderBy(q.sort, { need, due: 'd.due', ref: 'c.ref' }, 'd.due ASC NULLS FIRST, c.ref, c.id')
  return paged<PortfolioCoveringRow>(db, `c.id, c.ref, s.id AS "siteId", s.name AS "siteName", u.id AS "unitId", u.ref AS "unitRef", o.room,
        c.product_type AS "productType", c.control, c.last_verdict AS "lastVerdict", c.last_inspected_at AS "lastInspectedAt",
        to_char(d.due, 'YYYY-MM-DD') AS "dueOn", ${dueState} AS due, ${need} AS need,
        (SELECT count(*)::int FROM fixes fx WHERE fx.covering_id = c.id AND fx.status = 'open') AS "openRemedies"`,
  coveringFrom, where, order, replacements, q)
}

export class AuditRequestRefused extends Refusal {
  constructor(field: string, message: string, statusCode = 400) { super(statusCode, field, message) }
}

/** Audit requests one manager may send in an hour (AUDIT_REQUESTS_PER_HOUR); each e-mails the whole office. */
export const AUDIT_REQUESTS_PER_HOUR = envLimit('AUDIT_REQUESTS_PER_HOUR', 5)

/** E-mails the workspace (its contact address and every officer) naming the sites and units, and logs it. */
export async function requestAudit(db: Sequelize, actor: Actor & { name: string, email: string }, sites: Site[], body: AuditRequest) {
  const units = body.unitIds.length ? await Unit.findAll({ where: { id: body.unitIds } }) : []
  const siteIds = new Set(sites.map(s => s.id))
  if (units.length !== new Set(body.unitIds).size || units.some(u => !siteIds.has(u.siteId))) {
    throw new AuditRequestRefused('unitIds', 'unitIds: a unit listed is not in the sites chosen', 404)
  }
  const workspace = (await Workspace.findByPk(actor.workspaceId))!
  const client = actor.clientId ? await Client.findByPk(actor.clientId) : null
  const officers = await User.findAll({ where: { workspaceId: actor.workspaceId, role: 'officer', active: true }, order: [['email', 'ASC']] })
  const to = [...new Set([workspace.contactEmail, ...officers.map(o => o.email)].filter((e): e is string => !!e))]
  if (!to.length) throw new AuditRequestRefused('siteIds', 'Your installer has no contact address on record; call them instead', 409)
  const lines = sites.map((s) => {
    const listed = units.filter(u => u.siteId === s.id).map(u => `    - unit ${u.ref}${u.name ? ` (${u.name})` : ''}`)
    return [`  ${s.name} (site ${s.ref}), ${s.address}`, ...(listed.length ? listed : ['    - every unit']), `    ${appUrl(`/sites/${s.id}`)}`].join('\n')
  })
  const text = [
    `${actor.name} (${actor.email})${client ? ` of ${client.name}` : ''} asks for a cord-safety audit of:`, '', ...lines, '',
    body.preferredFrom ? `Preferred from: ${body.preferredFrom}` : null, body.message ? `Message:\n${body.message}` : null, '',
    'Reply to this e-mail to reach them. Tautline supports judgement; it does not certify.',
  ].filter(l => l !== null).join('\n')
  // Counted before the mail goes, so requests sent at once cannot all slip under the limit; one that fails to send is given back.
  const key = `audit-request:user:${actor.id}`
  const count = (await countHits(db, [key], 60)).get(key)!
  if (count.hits > AUDIT_REQUESTS_PER_HOUR) {
    await refundHits(db, [key])
    throw new AuditRequestRefused('siteIds', `You have sent ${AUDIT_REQUESTS_PER_HOUR} audit requests in the last hour; the next can go in ${minutesText(count.retryAfterS)}. For anything urgent, call your installer.`, 429)
  }
  try {
    await sendRecordedMail(db, { workspaceId: actor.workspaceId, causedBy: actor.id, kind: 'audit_request' },
      { to, replyTo: actor.email, subject: `Audit requested: ${client?.name ?? 'a client'} — ${sites.length === 1 ? sites[0]!.name : `${sites.length} sites`}`, text })
  }
  catch (err) {
    await refundHits(db, [key]).catch(() => undefined)
    throw new Refusal(503, null, 'The request could not be e-mailed just now; nothing was sent. Try again in a moment.', {}, err)
  }
  await logActivity({ workspaceId: actor.workspaceId, userId: actor.id, action: 'portfolio.audit_requested', entity: 'client', entityId: actor.clientId ?? null,
    detail: { siteIds: [...siteIds], unitIds: body.unitIds, preferredFrom: body.preferredFrom, sentTo: to } })
  return { sentTo: to, siteCount: sites.length, unitCount: units.length }
}
