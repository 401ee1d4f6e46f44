import { idParamsSchema } from '#shared/schemas/common'
import { clientPatchSchema } from '#shared/schemas/register'
import { updateLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ['admin', 'officer'])
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(clientPatchSchema))
  const client = await requireClientAccess(event, id)
  await uniqueOr409(() => updateLogged(client, body, user, 'client'), 'name', 'client')
  return client.toJSON()
})
