import { idParamsSchema } from '#shared/schemas/common'
import { coveringPatchSchema } from '#shared/schemas/register'
import { Covering } from '../../models'
import { updateLogged } from '../../services/records'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ['admin', 'officer', 'installer'])
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const body = await readValidatedBody(event, validateWith(coveringPatchSchema))
  const { record } = await requireInSite(event, Covering, id)
  await uniqueOr409(() => updateLogged(record, body, user, 'covering'), 'ref', 'covering on this site')
  return record.toJSON()
})
