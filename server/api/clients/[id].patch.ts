import { canAudit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { clientPatchSchema } from '#shared/schemas/register'
import { updateLogged } from '../../services/records'

// Tenant first, then the body: another tenant's record is 404 whatever was sent.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canAudit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const client = await requireClientAccess(event, id)
  const body = await readValidatedBody(event, validateWith(clientPatchSchema))
  await uniqueOr409(() => updateLogged(client, body, user, 'client'), 'name', 'client')
  return client.toJSON()
})
