import { canAdminister } from '#shared/access'
import { QueryTypes } from 'sequelize'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, canAdminister)
  const items = await useDb().query(`SELECT u.id, u.email, u.name, u.role, u.active, u.client_id AS "clientId", cl.name AS "clientName",
      u.last_sign_in_at AS "lastSignInAt", (u.password_hash IS NULL) AS "invitePending"
    FROM users u LEFT JOIN clients cl ON cl.id = u.client_id WHERE u.workspace_id = :ws ORDER BY u.role, u.name`,
  { type: QueryTypes.SELECT, replacements: { ws: admin.workspaceId } })
  return { items, total: items.length }
})
