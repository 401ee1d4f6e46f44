import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { openFixCounts } from './fixes'

// The site at a glance: verdict counts overall, by unit and by clause, the trend over closed
// audits, and the remedies still open.
export async function siteOverview(db: Sequelize, siteId: number) {
  const q = <T extends object>(sql: string) => db.query<T>(sql, { type: QueryTypes.SELECT, replacements: { siteId } })
  const [verdicts, byUnit, byClause, trend, fixes] = await Promise.all([
    q<{ verdict: string, n: number }>(`SELECT coalesce(last_verdict, 'unchecked') AS verdict, count(*)::int AS n
      FROM coverings WHERE site_id = :siteId AND status = 'in_place' GROUP BY 1`),
    q<{ unitId: number, unitRef: string, unitName: string | null, compliant: number, nonCompliant: number, incomplete: number, other: number }>(`
      SELECT u.id AS "unitId", u.ref AS "unitRef", u.name AS "unitName",
        count(c.id) FILTER (WHERE c.last_verdict = 'compliant')::int AS compliant,
        count(c.id) FILTER (WHERE c.last_verdict = 'non_compliant')::int AS "nonCompliant",
        count(c.id) FILTER (WHERE c.last_verdict = 'incomplete')::int AS incomplete,
        count(c.id) FILTER (WHERE c.last_verdict IS NULL OR c.last_verdict = 'not_applicable')::int AS other
      FROM units u LEFT JOIN openings o ON o.unit_id = u.id LEFT JOIN coverings c ON c.opening_id = o.id AND c.status = 'in_place'
      WHERE u.site_id = :siteId GROUP BY u.id ORDER BY u.ref`),
    q<{ clause: string, source: string, failing: number, missing: number }>(`
      SELECT f.clause, min(f.source) AS source, count(*) FILTER (WHERE f.verdict = 'fail')::int AS failing,
        count(*) FILTER (WHERE f.verdict = 'missing')::int AS missing
      FROM coverings c JOIN findings f ON f.inspection_id = c.last_inspection_id
      WHERE c.site_id = :siteId AND c.status = 'in_place' AND f.verdict IN ('fail', 'missing')
      GROUP BY f.clause ORDER BY failing DESC, missing DESC, f.clause`),
    q<{ auditId: number, closedAt: string, closedByName: string | null, summary: Record<string, number> }>(`
      SELECT id AS "auditId", closed_at AS "closedAt", closed_by_name AS "closedByName", summary
      FROM audits WHERE site_id = :siteId AND status = 'closed' ORDER BY closed_at LIMIT 24`),
    openFixCounts(db, siteId),
  ])
  return {
    verdicts: Object.fromEntries(verdicts.map(v => [v.verdict, v.n])) as Record<string, number>,
    byUnit, byClause, trend, fixes,
  }
}
