import { QueryTypes } from 'sequelize'
import { idParamsSchema } from '#shared/schemas/common'

export default defineEventHandler(async (event) => {
  await requireUser(event)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  await requireSiteAccess(event, id)
  const items = await useDb().query(`SELECT a.id, a.status, a.opened_at AS "openedAt", a.closed_at AS "closedAt", a.closed_by_name AS "closedByName",
      a.summary, (SELECT count(*)::int FROM audit_items ai WHERE ai.audit_id = a.id) AS total,
      (SELECT count(*)::int FROM audit_items ai WHERE ai.audit_id = a.id AND ai.status <> 'pending') AS done
    FROM audits a WHERE a.site_id = :id ORDER BY a.opened_at DESC LIMIT 100`, { type: QueryTypes.SELECT, replacements: { id } })
  return { items, total: items.length }
})
