import { canFit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { coveringPatchSchema } from '#shared/schemas/register'
import { Covering } from '../../models'
import { updateLogged } from '../../services/records'

// Tenant first, then the body: another tenant's record is 404 whatever was sent.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canFit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { record } = await requireInSite(event, Covering, id)
  const body = await readValidatedBody(event, validateWith(coveringPatchSchema))
  await uniqueOr409(() => updateLogged(record, body, user, 'covering'), 'ref', 'covering on this site')
  return record.toJSON()
})
