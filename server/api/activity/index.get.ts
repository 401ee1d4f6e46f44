import { canAudit } from '#shared/access'
import { QueryTypes } from 'sequelize'
import { z } from 'zod'
import { idValue, listQuerySchema } from '#shared/schemas/common'

const query = listQuerySchema(['at'], '-at').extend({
  entity: z.enum(['user', 'client', 'site', 'unit', 'opening', 'covering']).optional(),
  entityId: idValue('entityId').optional(),
})

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const q = await getValidatedQuery(event, validateWith(query))
  const where = ['a.workspace_id = :ws', ...(q.entity ? ['a.entity = :entity'] : []), ...(q.entityId ? ['a.entity_id = :entityId'] : [])]
  const replacements = { ws: user.workspaceId, entity: q.entity, entityId: q.entityId, limit: q.pageSize, offset: (q.page - 1) * q.pageSize }
  const db = useDb()
  const [items, [count]] = await Promise.all([
    db.query(`SELECT a.id, a.at, us.name AS "userName", a.action, a.entity, a.entity_id AS "entityId", a.detail
      FROM activity_log a LEFT JOIN users us ON us.id = a.user_id WHERE ${where.join(' AND ')}
      ORDER BY a.at ${q.sort === 'at' ? 'ASC' : 'DESC'}, a.id DESC LIMIT :limit OFFSET :offset`, { type: QueryTypes.SELECT, replacements }),
    db.query<{ total: number }>(`SELECT count(*)::int AS total FROM activity_log a WHERE ${where.join(' AND ')}`, { type: QueryTypes.SELECT, replacements }),
  ])
  return { items, total: count?.total ?? 0, page: q.page, pageSize: q.pageSize }
})
