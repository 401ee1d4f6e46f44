import { canAudit } from '#shared/access'
import { z } from 'zod'
import { idValue, listQuerySchema } from '#shared/schemas/common'
import { paged } from '../../services/paged'

const query = listQuerySchema(['at'], '-at').extend({
  entity: z.enum(['user', 'client', 'site', 'unit', 'opening', 'covering']).optional(),
  entityId: idValue('entityId').optional(),
})

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const q = await getValidatedQuery(event, validateWith(query))
  const where = ['a.workspace_id = :ws', ...(q.entity ? ['a.entity = :entity'] : []), ...(q.entityId ? ['a.entity_id = :entityId'] : [])]
  return paged(useDb(), `a.id, a.at, us.name AS "userName", a.action, a.entity, a.entity_id AS "entityId", a.detail`,
    'activity_log a LEFT JOIN users us ON us.id = a.user_id', where, `a.at ${q.sort === 'at' ? 'ASC' : 'DESC'}, a.id DESC`,
    { ws: user.workspaceId, entity: q.entity, entityId: q.entityId }, q, 'activity_log a')
})
