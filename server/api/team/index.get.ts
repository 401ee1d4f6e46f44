import { canAudit } from '#shared/access'
import { QueryTypes } from 'sequelize'

// The workspace's active staff, for picking who a remedy or a site is assigned to.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const items = await useDb().query(`SELECT id, name, role FROM users WHERE workspace_id = :ws AND active AND role <> 'manager' ORDER BY name`,
    { type: QueryTypes.SELECT, replacements: { ws: user.workspaceId } })
  return { items, total: items.length }
})
