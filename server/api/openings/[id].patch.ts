import { canFit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { openingPatchSchema } from '#shared/schemas/register'
import { Opening } from '../../models'
import { updateLogged } from '../../services/records'

// Tenant first, then the body: another tenant's record is 404 whatever was sent.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canFit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { record } = await requireInSite(event, Opening, id)
  const body = await readValidatedBody(event, validateWith(openingPatchSchema))
  await uniqueOr409(() => updateLogged(record, body, user, 'opening'), 'ref', 'opening in this unit')
  return record.toJSON()
})
