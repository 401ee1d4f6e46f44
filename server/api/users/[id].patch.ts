import { canAdminister } from '#shared/access'
import { userPatchSchema } from '#shared/schemas/auth'
import { idParamsSchema } from '#shared/schemas/common'
import { logActivity } from '../../services/activity'
import { revokeSessions } from '../../services/accounts'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, canAdminister)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const user = await requireWorkspaceUser(event, id)
  const body = await readValidatedBody(event, validateWith(userPatchSchema))
  if (user.id === admin.id && (body.active === false || (body.role && body.role !== 'admin'))) {
    throw createError({ statusCode: 400, message: 'role: you cannot remove your own admin access', data: { fields: { role: 'own account' } } })
  }
  const role = body.role ?? user.role
  const clientId = body.clientId !== undefined ? body.clientId : user.clientId
  if ((role === 'manager') !== (clientId != null)) {
    throw createError({ statusCode: 400, message: 'clientId: a property manager needs a client, and only a manager has one', data: { fields: { clientId: 'required for a manager only' } } })
  }
  if (clientId) await requireClientAccess(event, clientId)
  await user.update({ ...body, role, clientId: clientId ?? null })
  if (body.active === false) await revokeSessions(useDb(), { userId: user.id })
  await logActivity({ workspaceId: admin.workspaceId, userId: admin.id, action: 'user.updated', entity: 'user', entityId: user.id, detail: body })
  return { id: user.id, email: user.email, name: user.name, role: user.role, active: user.active, clientId: user.clientId }
})
