import { canAudit } from '#shared/access'
import { clientCreateSchema } from '#shared/schemas/register'
import { Client } from '../../models'
import { createLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const body = await readValidatedBody(event, validateWith(clientCreateSchema))
  const client = await uniqueOr409(() => createLogged(() => Client.create({ ...body, workspaceId: user.workspaceId }), user, 'client', { name: body.name }), 'name', 'client')
  setResponseStatus(event, 201)
  return client.toJSON()
})
