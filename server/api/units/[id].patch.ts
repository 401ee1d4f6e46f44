import { canFit } from '#shared/access'
import { idParamsSchema } from '#shared/schemas/common'
import { unitPatchSchema } from '#shared/schemas/register'
import { Unit } from '../../models'
import { updateLogged } from '../../services/records'

// Tenant first, then the body: another tenant's record is 404 whatever was sent.
export default defineEventHandler(async (event) => {
  const user = await requireRole(event, canFit)
  const { id } = await getValidatedRouterParams(event, validateWith(idParamsSchema))
  const { record } = await requireInSite(event, Unit, id)
  const body = await readValidatedBody(event, validateWith(unitPatchSchema))
  await uniqueOr409(() => updateLogged(record, body, user, 'unit'), 'ref', 'unit on this site')
  return record.toJSON()
})
